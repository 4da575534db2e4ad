// jstat ships no type declarations; these cover the functions Rhizomorph calls.
declare module "jstat" {
  interface Distribution {
    cdf(x: number, ...params: number[]): number;
    inv(p: number, ...params: number[]): number;
    pdf(x: number, ...params: number[]): number;
  }
  export const jStat: {
    studentt: Distribution;
    centralF: Distribution;
    chisquare: Distribution;
    normal: Distribution;
    noncentralt: Distribution;
    tukey: Distribution;
    beta: Distribution;
    ibeta(x: number, a: number, b: number): number;
    ibetainv(p: number, a: number, b: number): number;
    gammaln(x: number): number;
    gammafn(x: number): number;
    mean(xs: number[]): number;
    median(xs: number[]): number;
    stdev(xs: number[], sample?: boolean): number;
    variance(xs: number[], sample?: boolean): number;
    [name: string]: unknown;
  };
  export default jStat;
}
