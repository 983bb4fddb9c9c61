// jstat ships no types; the tests use only its chi-square distribution.
declare module "jstat" {
  const jStat: { chisquare: { cdf(x: number, degreesOfFreedom: number): number } };
  export default jStat;
}
