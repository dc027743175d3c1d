/** The trial stages in the order a development programme meets them. */
import type { Stage } from "./api.js";

export const STAGES: ReadonlyArray<{ stage: Stage; title: string; aim: string }> = [
  { stage: "dose-finding", title: "Dose finding", aim: "Choose a dose that patients tolerate, escalating in small cohorts." },
  { stage: "activity", title: "Activity", aim: "Look for a signal in a single arm before committing to a comparison." },
  { stage: "comparative", title: "Comparative", aim: "Size a trial that compares arms on the primary outcome." },
  { stage: "monitoring", title: "Monitoring", aim: "Plan interim looks and the boundaries for stopping early." },
];

export function stageTitle(stage: Stage): string {
  return STAGES.find((s) => s.stage === stage)?.title ?? stage;
}
