/**
 * "Did you mean": the known names nearest to a misspelt one, so that a typo in a model file, a log
 * header or a command line is answered with the name the user meant, never silently ignored. One
 * closeness rule for every message.
 */

/**
 * Edit distance with adjacent transpositions counted as one edit (optimal string alignment), so
 * that `fxied` is one step from `fixed`. Case differences count as edits: names are case-sensitive.
 */
export function editDistance(a: string, b: string): number {
  const n = a.length;
  const m = b.length;
  if (!n) return m;
  if (!m) return n;
  let prev2 = new Array<number>(m + 1).fill(0);
  let prev = Array.from({ length: m + 1 }, (_, j) => j);
  let cur = new Array<number>(m + 1).fill(0);
  for (let i = 1; i <= n; i++) {
    cur[0] = i;
    for (let j = 1; j <= m; j++) {
      const cost = a[i - 1] === b[j - 1] ? 0 : 1;
      let d = Math.min(prev[j] + 1, cur[j - 1] + 1, prev[j - 1] + cost);
      if (i > 1 && j > 1 && a[i - 1] === b[j - 2] && a[i - 2] === b[j - 1]) d = Math.min(d, prev2[j - 2] + 1);
      cur[j] = d;
    }
    [prev2, prev, cur] = [prev, cur, prev2];
  }
  return prev[m];
}

/**
 * How far `name` is from `word`: the edit distance, less for a case-insensitive match (0.5) or a
 * shared beginning of at least three characters (at most 1.25).
 */
function distance(word: string, name: string): number {
  const lower = word.toLowerCase();
  const nl = name.toLowerCase();
  const d = editDistance(word, name);
  if (nl === lower) return 0.5;
  // A shared beginning is the commonest typo pattern (sinn -> sin, equation -> equations).
  if (Math.min(lower.length, nl.length) >= 3 && (nl.startsWith(lower) || lower.startsWith(nl))) return Math.min(d, 1.5) - 0.25;
  return d;
}

/** About one edit in three characters (at least two), or a case-insensitive match, or a prefix. */
function isClose(word: string, name: string, d: number): boolean {
  return d <= Math.max(2, Math.ceil(Math.max(word.length, name.length) / 3));
}

function ranked(word: string, candidates: Iterable<string>): { name: string; d: number }[] {
  const scored: { name: string; d: number }[] = [];
  for (const name of new Set(candidates)) if (name !== word) scored.push({ name, d: distance(word, name) });
  return scored.sort((x, y) => x.d - y.d || x.name.localeCompare(y.name));
}

/** Up to `limit` candidates close to `word` (see isClose), nearest first; none when none is close. */
export function nearest(word: string, candidates: Iterable<string>, limit = 3): string[] {
  return ranked(word, candidates).filter((s) => isClose(word, s.name, s.d)).slice(0, limit).map((s) => s.name);
}

/**
 * The `limit` candidates nearest to `word`, close or not, nearest first: for messages that list
 * what exists ("nearest columns: ..."), which should never come out empty while there are names.
 */
export function nearestNames(word: string, candidates: Iterable<string>, limit = 3): string[] {
  return ranked(word, candidates).slice(0, limit).map((s) => s.name);
}

/**
 * Whether an absent name that is allowed to be absent (an output not logged) is rather a typo of
 * `name`: much stricter than a suggestion, at most one edit in three characters and at most two,
 * case ignored, since a positive answer turns a valid file into an error.
 */
export function isLikelyTypo(word: string, name: string): boolean {
  return editDistance(word.toLowerCase(), name.toLowerCase()) <= Math.min(2, Math.floor(word.length / 3));
}

/** Words for a "did you mean" hint: `did you mean "a" or "b"?`, or a list of what exists. */
export function suggestion(word: string, candidates: readonly string[], kind = 'names'): string {
  const near = nearest(word, candidates);
  if (near.length) return `did you mean ${orList(near.map((n) => `"${n}"`))}?`;
  if (!candidates.length) return `there are no ${kind} to choose from`;
  const shown = candidates.slice(0, 12).map((n) => `"${n}"`);
  return `known ${kind}: ${shown.join(', ')}${candidates.length > shown.length ? ', ...' : ''}`;
}

export function orList(items: readonly string[]): string {
  if (items.length <= 1) return items.join('');
  return `${items.slice(0, -1).join(', ')} or ${items[items.length - 1]}`;
}
