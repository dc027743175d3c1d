// Fixed Gauss-Legendre rules against closed-form nodes and weights
// (Abramowitz & Stegun 1964, Table 25.4 and 25.4.29) and exactness on polynomials.
import { describe, expect, it } from "vitest";
import { expectClose } from "../../support/fixtures.js";
import { gaussLegendreRule, integrateFixed } from "../../../src/stats/gaussLegendre.js";
import { integrate } from "../../../src/stats/quadrature.js";

describe("Gauss-Legendre rules", () => {
  it("reproduces the closed-form 2-, 3- and 5-point rules (Abramowitz & Stegun 1964, Table 25.4)", () => {
    const two = gaussLegendreRule(2);
    expectClose(two.nodes[1]!, 1 / Math.sqrt(3), 1e-15, { n: 2 });
    expectClose(two.weights[0]!, 1, 1e-15, { n: 2 });
    const three = gaussLegendreRule(3);
    expectClose(three.nodes[1]!, 0, 1e-16, { n: 3 });
    expectClose(three.nodes[2]!, Math.sqrt(3 / 5), 1e-15, { n: 3 });
    expectClose(three.weights[1]!, 8 / 9, 1e-15, { n: 3 });
    expectClose(three.weights[2]!, 5 / 9, 1e-15, { n: 3 });
    const five = gaussLegendreRule(5);
    expectClose(five.nodes[3]!, Math.sqrt(5 - 2 * Math.sqrt(10 / 7)) / 3, 1e-15, { n: 5 });
    expectClose(five.nodes[4]!, Math.sqrt(5 + 2 * Math.sqrt(10 / 7)) / 3, 1e-15, { n: 5 });
    expectClose(five.weights[2]!, 128 / 225, 1e-15, { n: 5 });
    expectClose(five.weights[3]!, (322 + 13 * Math.sqrt(70)) / 900, 1e-15, { n: 5 });
    expectClose(five.weights[4]!, (322 - 13 * Math.sqrt(70)) / 900, 1e-15, { n: 5 });
  });

  it("is exact for polynomials of degree 2n - 1 and its weights sum to 2", () => {
    for (const n of [1, 4, 16, 40, 96]) {
      const { nodes, weights } = gaussLegendreRule(n);
      expectClose(weights.reduce((a, b) => a + b, 0), 2, 1e-13, { n });
      for (let i = 1; i < n; i++) expect(nodes[i]!).toBeGreaterThan(nodes[i - 1]!);
      const degree = 2 * n - 1;
      // ∫_0^1 x^d dx = 1/(d + 1), a textbook identity.
      expectClose(integrateFixed((x) => x ** degree, 0, 1, n), 1 / (degree + 1), 1e-13, { n, degree });
    }
  });

  it("agrees with the adaptive Gauss-Kronrod integrator on a smooth peaked integrand", () => {
    const f = (x: number): number => Math.exp(-((x - 0.3) ** 2) / 0.02) * (1 + x * x);
    const reference = integrate(f, -2, 2, { absoluteTolerance: 1e-15, relativeTolerance: 1e-14 });
    expectClose(integrateFixed(f, -2, 2, 80), reference, 1e-12, { n: 80 }, "relative");
  });

  it("refuses orders outside 1..1000", () => {
    expect(() => gaussLegendreRule(0)).toThrow(RangeError);
    expect(() => gaussLegendreRule(2.5)).toThrow(RangeError);
  });
});
