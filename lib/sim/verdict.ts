/**
 * The verdict on one analysis in one scenario of a stress test: does it keep its false-positive
 * rate, the coverage of its confidence interval and the power the study plans for — judged
 * against each figure's Monte Carlo error (Morris, White & Crowther 2019, the MC SE of a rate
 * √(p(1 − p)/R), lib/sim/metrics.ts).
 *
 * Each rate is read with its Monte Carlo interval, value ± 1.96 MC SE (closed: a bound equal to
 * the nominal value still contains it).
 *
 * - False-positive rate (nominal α). **Broken** when the interval lies wholly above α AND the
 *   rate exceeds α by more than half of α (rate > 1.5α): the interval alone would call 5.6% at
 *   100,000 replicates broken, the margin alone would call a noisy 8% from 100 replicates
 *   broken. The margin of 0.5α is common practice in robustness studies (the "liberal
 *   criterion", from memory; not a reference of lib/citations.ts). **Inflated** when the
 *   interval lies wholly above α but within the margin. **Holds** otherwise (a rate below α is
 *   conservative, which costs power, not validity).
 * - Coverage (nominal 1 − α): the same rule on the miss rate 1 − coverage.
 * - Power: **below target** when the whole interval lies below the target power (the design's
 *   assumption), else it meets it.
 *
 * The cell's verdict is the worst of these, in this order: a broken false-positive rate, broken
 * coverage, an inflated rate or narrow intervals, power below target, holds. Power is never a
 * virtue of an analysis whose false-positive rate is broken or inflated: `powerCounts` is false
 * there, and the screen shows no power figure as an achievement.
 */

/** A rate with its Monte Carlo SE, as the results give it (null where it could not be estimated). */
export interface RateWithError {
  value: number | null;
  mcse: number | null;
}

/** Half-width of the Monte Carlo interval in MC SEs. */
export const MC_Z = 1.96;
/** A rate broken beyond its Monte Carlo error must also miss its nominal value by more than this share of α. */
export const BROKEN_MARGIN = 0.5;

export type RateVerdict = 'holds' | 'inflated' | 'broken' | 'unknown';
export type PowerVerdict = 'meets' | 'below' | 'unknown';
export type CellVerdict = 'holds' | 'underpowered' | 'caution' | 'broken' | 'no-result';

export interface Verdict {
  cell: CellVerdict;
  falsePositive: RateVerdict;
  coverage: RateVerdict;
  power: PowerVerdict;
  /** False when the false-positive rate is broken or inflated: the power figure is not to its credit. */
  powerCounts: boolean;
}

const finite = (x: number | null | undefined): x is number => x !== null && x !== undefined && Number.isFinite(x);

/** The Monte Carlo interval [value − 1.96 MC SE, value + 1.96 MC SE]; √(p(1 − p)/R) when the SE is missing. */
export function mcInterval(m: RateWithError, replicates: number): [number, number] | null {
  if (!finite(m.value)) return null;
  const se = finite(m.mcse) ? m.mcse : replicates > 0 ? Math.sqrt((m.value * (1 - m.value)) / replicates) : 0;
  return [m.value - MC_Z * se, m.value + MC_Z * se];
}

/**
 * A rate of errors (false positives, or misses of the interval) against its nominal value:
 * broken, inflated or holding, by its Monte Carlo interval and the margin.
 */
export function errorRateVerdict(m: RateWithError, nominal: number, replicates: number): RateVerdict {
  const iv = mcInterval(m, replicates);
  if (!iv) return 'unknown';
  if (iv[0] <= nominal) return 'holds';
  return m.value! > nominal * (1 + BROKEN_MARGIN) ? 'broken' : 'inflated';
}

export function powerVerdict(m: RateWithError, target: number, replicates: number): PowerVerdict {
  const iv = mcInterval(m, replicates);
  if (!iv) return 'unknown';
  return iv[1] < target ? 'below' : 'meets';
}

/** The verdict on one scenario × analysis from its false-positive rate, coverage and power. */
export function verdictOf(
  metrics: { typeIError?: RateWithError; coverage?: RateWithError; power?: RateWithError },
  { alpha, targetPower, replicates }: { alpha: number; targetPower: number; replicates: number },
): Verdict {
  const none: RateWithError = { value: null, mcse: null };
  const falsePositive = errorRateVerdict(metrics.typeIError ?? none, alpha, replicates);
  const cov = metrics.coverage ?? none;
  const coverage = errorRateVerdict(finite(cov.value) ? { value: 1 - cov.value, mcse: cov.mcse } : none, alpha, replicates);
  const power = powerVerdict(metrics.power ?? none, targetPower, replicates);
  const powerCounts = falsePositive === 'holds' || falsePositive === 'unknown';
  let cell: CellVerdict;
  if (falsePositive === 'unknown' && coverage === 'unknown' && power === 'unknown') cell = 'no-result';
  else if (falsePositive === 'broken' || coverage === 'broken') cell = 'broken';
  else if (falsePositive === 'inflated' || coverage === 'inflated') cell = 'caution';
  else if (power === 'below') cell = 'underpowered';
  else cell = 'holds';
  return { cell, falsePositive, coverage, power, powerCounts };
}

const RANK: Record<CellVerdict, number> = { holds: 0, underpowered: 1, caution: 2, 'no-result': 3, broken: 4 };

/**
 * The best analysis among `candidates` by its verdicts over the scenarios: fewest broken cells,
 * then fewest cautions, then fewest below target, then the highest lowest power among cells
 * whose power counts. Ties keep the candidates' order. Null when there is no candidate.
 */
export function bestAnalysis<A extends string>(candidates: readonly A[], cells: (analysis: A) => { verdict: Verdict; power: number | null }[]): A | null {
  let best: { a: A; key: number[] } | null = null;
  for (const a of candidates) {
    const list = cells(a);
    const count = (v: CellVerdict) => list.filter((c) => c.verdict.cell === v).length;
    const powers = list.filter((c) => c.verdict.powerCounts && finite(c.power)).map((c) => c.power!);
    const key = [count('broken'), count('no-result'), count('caution'), count('underpowered'), -(powers.length ? Math.min(...powers) : -1)];
    if (!best || compare(key, best.key) < 0) best = { a, key };
  }
  return best?.a ?? null;
}

function compare(a: number[], b: number[]): number {
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return a[i]! - b[i]!;
  return 0;
}

/** The worse of two cell verdicts. */
export function worse(a: CellVerdict, b: CellVerdict): CellVerdict {
  return RANK[a] >= RANK[b] ? a : b;
}
