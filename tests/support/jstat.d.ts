// The part of jstat's API the unit tests use as an independent reference (jstat ships no types).
declare module 'jstat' {
  type Dist = {
    cdf(x: number, ...params: number[]): number;
    pdf(x: number, ...params: number[]): number;
  };
  type JStat = {
    gammaln(x: number): number;
    ibeta(x: number, a: number, b: number): number;
    mean(values: number[]): number;
    stdev(values: number[], sample?: boolean): number;
    range(values: number[]): number;
    centralF: Dist;
    normal: Dist & { inv(p: number, mean: number, sd: number): number };
    beta: Dist & { inv(p: number, a: number, b: number): number };
    weibull: Dist;
  };
  export const jStat: JStat;
  const jstat: JStat;
  export default jstat;
}
