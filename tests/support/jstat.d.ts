// jstat ships no types; these are the few functions the unit tests use as a cross-check.
declare module 'jstat' {
  type Dist = {
    pdf(x: number, mean: number, sd: number): number;
    cdf(x: number, mean: number, sd: number): number;
    inv(p: number, mean: number, sd: number): number;
  };
  const jStat: {
    normal: Dist;
    gammaln(x: number): number;
    mean(values: number[]): number;
    stdev(values: number[], sample?: boolean): number;
    range(values: number[]): number;
  };
  export default jStat;
}
