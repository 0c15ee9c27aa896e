// jstat 1.9.6 ships no types; the engine tests use a few of its CDFs and quantiles.
declare module 'jstat' {
  interface Dist2 {
    cdf(x: number, a: number, b: number): number;
    pdf(x: number, a: number, b: number): number;
    inv(p: number, a: number, b: number): number;
    mean(a: number, b: number): number;
    variance(a: number, b: number): number;
  }
  interface Dist3 {
    cdf(x: number, a: number, b: number, c: number): number;
    pdf(x: number, a: number, b: number, c: number): number;
    inv(p: number, a: number, b: number, c: number): number;
    mean(a: number, b: number, c: number): number;
    variance(a: number, b: number, c: number): number;
  }
  interface Dist1 {
    cdf(x: number, a: number): number;
    pdf(x: number, a: number): number;
    inv(p: number, a: number): number;
    mean(a: number): number;
    variance(a: number): number;
  }
  export const jStat: {
    normal: Dist2;
    lognormal: Dist2;
    uniform: Dist2;
    beta: Dist2;
    weibull: Dist2;
    gamma: Dist2;
    exponential: Dist1;
    triangular: Dist3;
    ibeta(x: number, a: number, b: number): number;
    ibetainv(p: number, a: number, b: number): number;
    gammafn(x: number): number;
    gammaln(x: number): number;
    erf(x: number): number;
    erfc(x: number): number;
  };
  export default jStat;
}
