/**
 * The verdict on one analysis in one scenario of a stress test: does it keep its false-positive
 * rate, the coverage of its confidence interval and the power the study plans for — judged
 * against each figure's Monte Carlo error (Morris, White & Crowther 2019, the MC SE of a rate
 * √(p(1 − p)/R), lib/sim/metrics.ts).
 *
 * Each rate is read with its Monte Carlo interval, value ± 1.96 MC SE (closed: a bound equal to
 * the nominal value still contains it).
 *
 * - False-positive rate (nominal α), against the liberal bound 1.5α (Bradley 1978's "liberal
 *   criterion": a rate within 0.5α–1.5α counts as robust; BRADLEY_1978 in lib/citations.ts).
 *   **Broken** when the interval lies wholly above α AND the rate exceeds 1.5α: the interval
 *   alone would call 5.6% at 100,000 replicates broken, the bound alone would call a noisy 8%
 *   from 100 replicates broken. **Inflated** when the interval lies wholly above α but the rate
 *   is within the bound. **Undecided** (too few replicates to tell) when the interval reaches
 *   down to α but also past 1.5α: the run agrees with a rate that holds and with one that is
 *   broken (6% ± 4.7% SE: interval −3.2% to 15.2%). **Holds** otherwise: the interval reaches α
 *   and stays within 1.5α (a rate below α is conservative, which costs power, not validity).
 * - Coverage (nominal 1 − α): the same rule on the miss rate 1 − coverage, so the bound on
 *   coverage is 1 − 1.5α (92.5% for 95% intervals; 90.0% ± 3.0% at 100 replicates: miss rate
 *   interval 4.1% to 15.9%, undecided).
 * - How many replicates would settle an undecided rate (`replicatesToSettle`): the MC SE
 *   shrinks as 1/√R, so if the rate stays where it is, its interval clears the nearer-to-settle
 *   side (1.5α from below, or α from above) once 1.96 · SE · √(R/R') ≤ gap, i.e. at
 *   R' = R · (1.96 SE / gap)², gap = max(1.5α − rate, rate − α). A rough guide: the rate itself
 *   moves as replicates are added.
 * - Power: **below target** when the whole interval lies below the target power (the design's
 *   assumption), else it meets it.
 *
 * The cell's verdict is the worst of these, in this order: a broken false-positive rate, broken
 * coverage, an inflated rate or narrow intervals, power below target, holds. Power is never a
 * virtue of an analysis whose false-positive rate is broken, undecided or inflated, or whose intervals
 * miss the true effect (a biased estimate): `powerCounts` is false there, and the screen shows no
 * power figure as an achievement.
 */

/** A rate with its Monte Carlo SE, as the results give it (null where it could not be estimated). */
export interface RateWithError {
  value: number | null;
  mcse: number | null;
}

/** Half-width of the Monte Carlo interval in MC SEs. */
export const MC_Z = 1.96;
/** The liberal bound as a multiple of the nominal error rate: 1.5α (Bradley 1978). */
export const LIBERAL_BOUND = 1.5;

export type RateVerdict = 'holds' | 'undecided' | 'inflated' | 'broken' | 'unknown';
export type PowerVerdict = 'meets' | 'below' | 'unknown';
export const CELL_VERDICTS = ['holds', 'underpowered', 'caution', 'undecided', 'broken', 'no-result'] as const;
export type CellVerdict = (typeof CELL_VERDICTS)[number];

export interface Verdict {
  cell: CellVerdict;
  falsePositive: RateVerdict;
  coverage: RateVerdict;
  power: PowerVerdict;
  /** False when the false-positive rate is broken, undecided or inflated, or the coverage is broken: the power figure is not to its credit. */
  powerCounts: boolean;
  /** For an undecided cell, the replicates per scenario (in all) that would roughly settle it; else null. */
  settleAt: number | null;
}

const finite = (x: number | null | undefined): x is number => x !== null && x !== undefined && Number.isFinite(x);

/** The MC SE of the rate; √(p(1 − p)/R) when it is missing. Null without a value. */
function seOf(m: RateWithError, replicates: number): number | null {
  if (!finite(m.value)) return null;
  return finite(m.mcse) ? m.mcse : replicates > 0 ? Math.sqrt((m.value * (1 - m.value)) / replicates) : 0;
}

/** The Monte Carlo interval [value − 1.96 MC SE, value + 1.96 MC SE]; √(p(1 − p)/R) when the SE is missing. */
export function mcInterval(m: RateWithError, replicates: number): [number, number] | null {
  const se = seOf(m, replicates);
  if (se === null) return null;
  return [m.value! - MC_Z * se, m.value! + MC_Z * se];
}

/**
 * A rate of errors (false positives, or misses of the interval) against its nominal value:
 * broken, inflated, undecided or holding, by its Monte Carlo interval and the liberal bound.
 */
export function errorRateVerdict(m: RateWithError, nominal: number, replicates: number): RateVerdict {
  const iv = mcInterval(m, replicates);
  if (!iv) return 'unknown';
  const liberal = nominal * LIBERAL_BOUND;
  if (iv[0] <= nominal) return iv[1] > liberal ? 'undecided' : 'holds';
  return m.value! > liberal ? 'broken' : 'inflated';
}

/**
 * The replicates per scenario, in all, at which an undecided error rate would be settled if it
 * stayed where it is: R · (1.96 SE / gap)², gap = max(1.5α − rate, rate − α), rounded up to two
 * significant digits (it is a rough guide). Null for a rate that is not undecided.
 */
export function replicatesToSettle(m: RateWithError, nominal: number, replicates: number): number | null {
  if (errorRateVerdict(m, nominal, replicates) !== 'undecided') return null;
  const se = seOf(m, replicates)!;
  const gap = Math.max(nominal * LIBERAL_BOUND - m.value!, m.value! - nominal);
  return roundUp2(Math.max(replicates, Math.ceil(replicates * ((MC_Z * se) / gap) ** 2)));
}

/** Rounded up to two significant digits: 1,347 → 1,400; 139 → 140; 38 → 38. */
function roundUp2(n: number): number {
  const step = 10 ** Math.max(0, Math.floor(Math.log10(n)) - 1);
  return Math.ceil(n / step) * step;
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
  const fp = metrics.typeIError ?? none;
  const falsePositive = errorRateVerdict(fp, alpha, replicates);
  const cov = metrics.coverage ?? none;
  const miss = finite(cov.value) ? { value: 1 - cov.value, mcse: cov.mcse } : none;
  const coverage = errorRateVerdict(miss, alpha, replicates);
  const power = powerVerdict(metrics.power ?? none, targetPower, replicates);
  // A biased estimate (intervals that miss the truth) rejects for the wrong reason: its power is no virtue either.
  const powerCounts = (falsePositive === 'holds' || falsePositive === 'unknown') && coverage !== 'broken';
  let cell: CellVerdict;
  if (falsePositive === 'unknown' && coverage === 'unknown' && power === 'unknown') cell = 'no-result';
  else if (falsePositive === 'broken' || coverage === 'broken') cell = 'broken';
  else if (falsePositive === 'undecided' || coverage === 'undecided') cell = 'undecided';
  else if (falsePositive === 'inflated' || coverage === 'inflated') cell = 'caution';
  else if (power === 'below') cell = 'underpowered';
  else cell = 'holds';
  const settle = [replicatesToSettle(fp, alpha, replicates), replicatesToSettle(miss, alpha, replicates)].filter(finite);
  const settleAt = cell === 'undecided' && settle.length > 0 ? Math.max(...settle) : null;
  return { cell, falsePositive, coverage, power, powerCounts, settleAt };
}

// An undecided cell may turn out broken: worse than a known small excess, better than no figures.
const RANK: Record<CellVerdict, number> = { holds: 0, underpowered: 1, caution: 2, undecided: 3, 'no-result': 4, broken: 5 };

/**
 * The best analysis among `candidates` by its verdicts over the scenarios: fewest broken cells,
 * then fewest without a result, then fewest undecided, then fewest cautions, then fewest below target, then the highest lowest power among cells
 * whose power counts. Ties keep the candidates' order. Null when there is no candidate.
 */
export function bestAnalysis<A extends string>(candidates: readonly A[], cells: (analysis: A) => { verdict: Verdict; power: number | null }[]): A | null {
  let best: { a: A; key: number[] } | null = null;
  for (const a of candidates) {
    const list = cells(a);
    const count = (v: CellVerdict) => list.filter((c) => c.verdict.cell === v).length;
    const powers = list.filter((c) => c.verdict.powerCounts && finite(c.power)).map((c) => c.power!);
    const key = [count('broken'), count('no-result'), count('undecided'), count('caution'), count('underpowered'), -(powers.length ? Math.min(...powers) : -1)];
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
