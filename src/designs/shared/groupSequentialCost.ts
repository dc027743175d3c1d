/**
 * The work of group-sequential boundaries (groupSequentialPlan.ts), counted in
 * looks. At each look the boundary is a root of a crossing probability summed
 * over the look's grid, and the drift (the maximum information) is found by
 * secant steps that each pass the recursion over every look; with futility,
 * each of those steps also solves a futility boundary at every look. So the
 * work grows with the looks, by a factor set by the futility boundaries.
 *
 * Counted over every boundary family, γ at ±10, fractions bunched at 0.01 or
 * at 0.99, one- and two-sided tests, α from 1e-5 to 0.5 and power up to
 * 0.9999: at most 20 passes of the grid from look to look and 121 crossing sums
 * per look without futility, 34 and 741 with it; observed looks take fewer, as
 * the drift is kept. The costs per look are the heaviest group-sequential cases
 * of `npm run bench designs` divided by their looks: 2 to 4.7 ms CPU a look
 * without futility and 3.8 to 6.9 ms with it while other work shared the
 * machine (wall-clock medians reached twice that under the heaviest load).
 */
import type { WorkEstimate } from "../design.js";
import type { InterimLooksInput } from "./interimLooks.js";
import { type WorkPart, workEstimate } from "./workEstimate.js";

const MS_PER_LOOK = 5.5;
const MS_PER_LOOK_WITH_FUTILITY = 8;

/** Boundaries at `looks` looks (planned or observed), with or without futility boundaries. */
export function groupSequentialWork(looks: number, futility: boolean, which = "looks"): WorkPart {
  return {
    count: looks,
    msEach: futility ? MS_PER_LOOK_WITH_FUTILITY : MS_PER_LOOK,
    what: `${which} of group-sequential boundaries${futility ? " with futility" : ""} (recursive numerical integration)`,
  };
}

/** A comparative design's estimate from its own parts, adding the boundaries of its interim looks (and the field to reduce) when it has them. */
export function withInterimLooks(parts: WorkPart[], interimLooks: InterimLooksInput | undefined): WorkEstimate {
  if (!interimLooks) return workEstimate(parts, []);
  return workEstimate([...parts, groupSequentialWork(interimLooks.looks, interimLooks.futilityBoundary !== "none")], ["interimLooks"]);
}
