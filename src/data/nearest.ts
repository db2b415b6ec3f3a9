/** Nearest names for "did you mean" messages (edit distance, case-insensitive). */

/** Levenshtein distance between two strings (case-insensitive). */
export function editDistance(a: string, b: string): number {
  const s = a.toLowerCase();
  const t = b.toLowerCase();
  if (s === t) return 0;
  let prev = new Array<number>(t.length + 1);
  let cur = new Array<number>(t.length + 1);
  for (let j = 0; j <= t.length; j++) prev[j] = j;
  for (let i = 1; i <= s.length; i++) {
    cur[0] = i;
    for (let j = 1; j <= t.length; j++) {
      const cost = s[i - 1] === t[j - 1] ? 0 : 1;
      cur[j] = Math.min(prev[j] + 1, cur[j - 1] + 1, prev[j - 1] + cost);
    }
    [prev, cur] = [cur, prev];
  }
  return prev[t.length];
}

/** Up to `count` candidates ordered by distance to `name` (ties keep the candidates' order). */
export function nearestNames(name: string, candidates: readonly string[], count = 3): string[] {
  return candidates
    .map((c, i) => ({ c, i, d: editDistance(name, c) }))
    .sort((x, y) => x.d - y.d || x.i - y.i)
    .slice(0, count)
    .map((x) => x.c);
}
