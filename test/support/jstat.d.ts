// The parts of jStat's untyped API that the cross-check tests use.
declare module "jstat" {
  interface Distribution1 { cdf(x: number, a: number): number; inv(p: number, a: number): number }
  interface Distribution2 { cdf(x: number, a: number, b: number): number; inv(p: number, a: number, b: number): number; pdf(x: number, a: number, b: number): number }
  export const jStat: {
    normal: Distribution2;
    studentt: Distribution1;
    beta: Distribution2;
    noncentralt: { cdf(x: number, df: number, ncp: number): number };
    binomial: { cdf(k: number, n: number, p: number): number; pdf(k: number, n: number, p: number): number };
  };
}
