import { bench } from "./harness.js";
import { timeToEvent } from "../src/designs/timeToEvent.js";

const base = timeToEvent.input.parse(timeToEvent.example);
bench("time-to-event: Schoenfeld events and enrolment (example, with calendar and power curve)", () => timeToEvent.compute(base));
bench("time-to-event: detectable hazard ratio from 400 events", () =>
  timeToEvent.compute(timeToEvent.input.parse({ solveFor: "hazard-ratio", events: 400, controlMedianYears: 1.5, accrualYears: 2.5, followUpYears: 1.5 })));
bench("time-to-event: report document", () => timeToEvent.document(base, timeToEvent.compute(base)));
