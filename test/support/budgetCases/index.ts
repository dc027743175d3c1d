// Every design's budget cases, by design id.
import { comparativeCases } from "./comparative.js";
import { doseFindingCases } from "./doseFinding.js";
import { singleArmCases } from "./singleArm.js";
import type { BudgetCaseTable } from "./types.js";

export type { BudgetCase, BudgetCaseTable, DesignBudgetCases, OverBudgetCase } from "./types.js";

export const budgetCases: BudgetCaseTable = { ...comparativeCases, ...singleArmCases, ...doseFindingCases };
