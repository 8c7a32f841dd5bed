/** "Did you mean" for unknown names: the nearest candidate by edit distance, if near enough. */
export function nearest(name: string, candidates: Iterable<string>): string | undefined {
  let best: string | undefined;
  let bestScore = Infinity;
  const limit = Math.max(1, Math.floor(name.length / 3));
  for (const c of candidates) {
    if (c === name) continue;
    const d = c.toLowerCase() === name.toLowerCase() ? 0.5 : distance(name, c);
    if (d < bestScore || (d === bestScore && best !== undefined && c < best)) {
      best = c;
      bestScore = d;
    }
  }
  return bestScore <= limit ? best : undefined;
}

/** Levenshtein distance with adjacent transpositions counted as one edit. */
export function distance(a: string, b: string): number {
  const m = a.length, n = b.length;
  if (Math.abs(m - n) > 3) return Math.abs(m - n);
  let prev2: number[] = [];
  let prev = Array.from({ length: n + 1 }, (_, j) => j);
  for (let i = 1; i <= m; i++) {
    const cur = [i];
    for (let j = 1; j <= n; j++) {
      const cost = a[i - 1] === b[j - 1] ? 0 : 1;
      let v = Math.min(prev[j] + 1, cur[j - 1] + 1, prev[j - 1] + cost);
      if (i > 1 && j > 1 && a[i - 1] === b[j - 2] && a[i - 2] === b[j - 1]) v = Math.min(v, prev2[j - 2] + 1);
      cur.push(v);
    }
    prev2 = prev;
    prev = cur;
  }
  return prev[n];
}
