/**
 * Comparing two samples of timings without assuming a distribution: how often one sample's value
 * exceeds the other's (the Mann–Whitney U statistic scaled to 0…1, 0.5 when the two are alike and
 * 0 or 1 when every value of one lies beyond every value of the other), and the largest gap
 * between their empirical distribution functions (the Kolmogorov–Smirnov D, 0…1).
 */

/** U / (n·m): the probability that a draw from `a` exceeds one from `b` (ties count half). */
export function probabilityOfSuperiority(a: readonly number[], b: readonly number[]): number {
  let wins = 0;
  for (const x of a) for (const y of b) wins += x > y ? 1 : x === y ? 0.5 : 0;
  return wins / (a.length * b.length);
}

/** The two-sample Kolmogorov–Smirnov statistic D = sup |F_a(t) − F_b(t)|. */
export function ksStatistic(a: readonly number[], b: readonly number[]): number {
  const xs = [...a].sort((p, q) => p - q);
  const ys = [...b].sort((p, q) => p - q);
  let i = 0;
  let j = 0;
  let d = 0;
  while (i < xs.length && j < ys.length) {
    const t = Math.min(xs[i]!, ys[j]!);
    while (i < xs.length && xs[i]! <= t) i++;
    while (j < ys.length && ys[j]! <= t) j++;
    d = Math.max(d, Math.abs(i / xs.length - j / ys.length));
  }
  return d;
}

export function median(values: readonly number[]): number {
  const s = [...values].sort((p, q) => p - q);
  const mid = s.length >> 1;
  return s.length % 2 ? s[mid]! : (s[mid - 1]! + s[mid]!) / 2;
}
