import type { BudgetCaseTable } from "./types.js";

export const singleArmCases: BudgetCaseTable = {};
