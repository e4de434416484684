// jstat ships no types; the part used here: the chi-square distribution's quantile.
declare module "jstat" {
  export const jStat: {
    chisquare: {
      /** The value below which a χ² variable of `dof` degrees of freedom falls with probability `p`. */
      inv(p: number, dof: number): number;
    };
  };
}
