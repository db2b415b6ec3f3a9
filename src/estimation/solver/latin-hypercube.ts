/**
 * Latin hypercube sample in the unit cube: n points in d dimensions such that, in every dimension,
 * each of the n equal strata [k/n, (k+1)/n) holds exactly one point (McKay, Beckman and Conover
 * 1979). Spreads few points over all the ranges at once, unlike a grid.
 */
export function latinHypercube(n: number, d: number, random: () => number): number[][] {
  const points = Array.from({ length: n }, () => new Array<number>(d).fill(0));
  for (let j = 0; j < d; j++) {
    // Fisher-Yates shuffle of the strata for this dimension.
    const strata = Array.from({ length: n }, (_, k) => k);
    for (let k = n - 1; k > 0; k--) {
      const m = Math.floor(random() * (k + 1));
      [strata[k], strata[m]] = [strata[m]!, strata[k]!];
    }
    for (let i = 0; i < n; i++) points[i]![j] = (strata[i]! + random()) / n;
  }
  return points;
}
