// ml-regression-theil-sen ships no types; the part used here: the median of pairwise slopes and the
// median intercept of a straight line.
declare module "ml-regression-theil-sen" {
  export class TheilSenRegression {
    constructor(x: ArrayLike<number>, y: ArrayLike<number>);
    slope: number;
    intercept: number;
    predict(x: number): number;
  }
}
