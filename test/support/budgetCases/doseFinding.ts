import type { BudgetCaseTable } from "./types.js";

export const doseFindingCases: BudgetCaseTable = {};
