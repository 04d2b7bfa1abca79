/** The parts of jstat 1.9.6 that Siderea uses (the package ships no types). */
declare module "jstat" {
  export const jStat: {
    chisquare: { cdf(x: number, dof: number): number; inv(p: number, dof: number): number };
    normal: { cdf(x: number, mean: number, sd: number): number; inv(p: number, mean: number, sd: number): number };
  };
}
