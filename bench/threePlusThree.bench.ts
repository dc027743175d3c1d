import { bench } from "./harness.js";
import { threePlusThree, threePlusThreeOperatingCharacteristics } from "../src/designs/threePlusThree.js";

const example = threePlusThree.input.parse(threePlusThree.example);
bench("three-plus-three: example (5 doses), with report", () => threePlusThree.document(example, threePlusThree.compute(example)));
const twelve = [0.01, 0.02, 0.03, 0.05, 0.07, 0.1, 0.13, 0.17, 0.22, 0.3, 0.4, 0.55];
bench("three-plus-three: 12 doses, next lower dose", () => threePlusThreeOperatingCharacteristics(twelve, "next-lower-dose"));
bench("three-plus-three: 12 doses, six at the MTD", () => threePlusThreeOperatingCharacteristics(twelve, "next-lower-dose-with-six"));
bench("three-plus-three: 12 safe doses (widest tree), six at the MTD", () => threePlusThreeOperatingCharacteristics(twelve.map(() => 0.01), "next-lower-dose-with-six"));
