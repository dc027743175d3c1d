/** The catalog: every design the service computes. Adding a design is one line here. */
import type { AnyDesign } from "./design.js";
import { twoMeans } from "./twoMeans.js";
import { twoProportions } from "./twoProportions.js";
import { crossover2x2 } from "./crossover2x2.js";
import { boin } from "./boin.js";
import { crm } from "./crm.js";
import { doseFindingComparison } from "./doseFindingComparison.js";
import { threePlusThree } from "./threePlusThree.js";
import { bayesianMonitoring } from "./bayesianMonitoring.js";
import { timeToEvent } from "./timeToEvent.js";
import { factorial2x2 } from "./factorial2x2.js";
import { singleStageBinomial } from "./singleStageBinomial.js";
import { simonTwoStage } from "./simonTwoStage.js";
import { gehanTwoStage } from "./gehanTwoStage.js";
import { twoStageInference } from "./twoStageInference.js";
import { groupSequential } from "./groupSequential.js";

export const catalog: readonly AnyDesign[] = [
  twoMeans,
  twoProportions,
  crossover2x2,
  boin,
  crm,
  doseFindingComparison,
  threePlusThree,
  bayesianMonitoring,
  timeToEvent,
  factorial2x2,
  singleStageBinomial,
  simonTwoStage,
  gehanTwoStage,
  twoStageInference,
  groupSequential,
];

const byId = new Map(catalog.map((d) => [d.id, d]));

export function findDesign(id: string): AnyDesign | undefined {
  return byId.get(id);
}
