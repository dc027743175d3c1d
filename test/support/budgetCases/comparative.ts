import type { BudgetCaseTable } from "./types.js";

export const comparativeCases: BudgetCaseTable = {};
