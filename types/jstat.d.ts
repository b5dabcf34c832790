// jstat ships no type declarations; declare the parts Keelson uses.
declare module 'jstat' {
  interface Jstat {
    mean(a: number[]): number;
    variance(a: number[], sample?: boolean): number;
    stdev(a: number[], sample?: boolean): number;
    corrcoeff(a: number[], b: number[]): number;
    covariance(a: number[], b: number[]): number;
    percentile(a: number[], k: number, exclusive?: boolean): number;
    normal: {
      cdf(x: number, mean: number, std: number): number;
      inv(p: number, mean: number, std: number): number;
      pdf(x: number, mean: number, std: number): number;
    };
    lognormal: {
      cdf(x: number, mu: number, sigma: number): number;
      inv(p: number, mu: number, sigma: number): number;
      pdf(x: number, mu: number, sigma: number): number;
      mean(mu: number, sigma: number): number;
      variance(mu: number, sigma: number): number;
      median(mu: number, sigma: number): number;
    };
    [key: string]: unknown;
  }
  const jStat: Jstat;
  export { jStat };
  export default jStat;
}
