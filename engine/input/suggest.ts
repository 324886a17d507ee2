/**
 * "Did you mean …?" for mistyped keys, target kinds, commands and options: the known names closest
 * to what was written by optimal-string-alignment distance (Damerau–Levenshtein with adjacent
 * transpositions, each edit costing 1; F. J. Damerau, Commun. ACM 7, 171 (1964)), compared without
 * case and with "-" and "_" taken as equal, so `wavelenght`, `Wavelength` and `at-least` find
 * their key.
 */

/** Edit distance between a and b: insertions, deletions, substitutions and adjacent transpositions. */
export function editDistance(a: string, b: string): number {
  const d: number[][] = Array.from({ length: a.length + 1 }, (_, i) => Array.from({ length: b.length + 1 }, (_, j) => (i === 0 ? j : j === 0 ? i : 0)));
  for (let i = 1; i <= a.length; i++) {
    for (let j = 1; j <= b.length; j++) {
      const cost = a[i - 1] === b[j - 1] ? 0 : 1;
      let v = Math.min(d[i - 1]![j]! + 1, d[i]![j - 1]! + 1, d[i - 1]![j - 1]! + cost);
      if (i > 1 && j > 1 && a[i - 1] === b[j - 2] && a[i - 2] === b[j - 1]) v = Math.min(v, d[i - 2]![j - 2]! + 1);
      d[i]![j] = v;
    }
  }
  return d[a.length]![b.length]!;
}

const normal = (s: string): string => s.toLowerCase().replace(/-/g, '_');

/**
 * The known names within reach of `written`, closest first (at most `max`): an edit distance of at
 * most a third of the longer name (at least 1, at most 3), or one name containing the other.
 */
export function closestNames(written: string, known: readonly string[], max = 2): string[] {
  const w = normal(written);
  if (w === '') return [];
  return known
    .map((name) => {
      const n = normal(name);
      const reach = Math.min(3, Math.max(1, Math.floor(Math.max(n.length, w.length) / 3)));
      const distance = editDistance(w, n);
      const contained = Math.min(n.length, w.length) >= 3 && (n.includes(w) || w.includes(n));
      return { name, distance, ok: distance <= reach || contained };
    })
    .filter((c) => c.ok && c.name !== written)
    .sort((a, b) => a.distance - b.distance || a.name.localeCompare(b.name))
    .slice(0, max)
    .map((c) => c.name);
}

/** ' (did you mean "a" or "b"?)' for the closest names, or '' when none is near. */
export function didYouMean(written: string, known: readonly string[]): string {
  const hits = closestNames(written, known);
  return hits.length === 0 ? '' : ` (did you mean ${hits.map((h) => `"${h}"`).join(' or ')}?)`;
}
