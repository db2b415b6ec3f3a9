/** The typical sample interval of a time vector: the median of its positive steps (NaN if none). */
export function sampleInterval(time: ArrayLike<number>): number {
  const steps: number[] = [];
  for (let i = 1; i < time.length; i++) {
    const dt = time[i] - time[i - 1];
    if (Number.isFinite(dt) && dt > 0) steps.push(dt);
  }
  if (steps.length === 0) return NaN;
  // The median, not the mean: a pause in logging must not stretch every lag converted to time.
  steps.sort((a, b) => a - b);
  const mid = steps.length >> 1;
  return steps.length % 2 ? steps[mid] : (steps[mid - 1] + steps[mid]) / 2;
}
