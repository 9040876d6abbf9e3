/**
 * What a calculation's answer means, in one sentence, and which of its values lead the result.
 * Reads only the output's `result` (the API's names); a value the output lacks reads "—"
 * rather than a guessed number.
 */
import type { CalculationOutput, ResultValue } from '@/lib/stats/calculations/types';
import { calculationSchema, type CalculationKind } from '@/lib/stats/calculations/request';
import { formatNumber, formatPercent, formatValue } from './format';
import { nounFor } from '@/lib/format';

const SCHEMA_KEYS = Object.fromEntries(calculationSchema.options.map((o) => [o.shape.kind.value, Object.keys(o.shape).filter((k) => k !== 'kind' && k !== 'solveFor')])) as Record<
  CalculationKind,
  string[]
>;

/**
 * The names a kind takes as input (every field of its schema), in the schema's order. When a
 * size or an effect was solved for, `power` in the result is the power achieved and the target
 * given comes back as `targetPower`.
 */
export function inputKeys(output: Pick<CalculationOutput, 'kind' | 'solvedFor' | 'result'>): string[] {
  return SCHEMA_KEYS[output.kind]
    .filter((k) => k !== output.solvedFor)
    .map((k) => (k === 'power' && output.solvedFor && 'targetPower' in output.result ? 'targetPower' : k));
}

/**
 * Values shown large: the solved one with the power it achieves (and the slope behind a solved
 * f²); for kinds that solve nothing, their main derived values.
 */
export function headlineKeys(output: CalculationOutput): string[] {
  const present = (keys: string[]) => keys.filter((k) => k in output.result);
  if (output.kind === 'optimal-allocation') {
    return present(['clusterSizeInteger', 'clustersPerArm', ...(output.solvedFor === 'budget' ? ['budget'] : []), ...(num(output.result.power) !== undefined ? ['power'] : [])]);
  }
  if (output.solvedFor) {
    const slope = output.kind === 'regression' && output.solvedFor === 'f2' && num(output.result.slope) !== undefined ? ['slope'] : [];
    return [output.solvedFor, ...slope, ...(output.solvedFor === 'power' ? [] : present(['power']))];
  }
  if (output.kind === 'design-effect') return present(['designEffect', 'effectiveSampleSize', 'naiveTypeIError']);
  return [];
}

const num = (v: ResultValue | undefined) => (typeof v === 'number' && Number.isFinite(v) ? v : undefined);
const show = (v: ResultValue | undefined) => (v === undefined || v === null ? '—' : formatValue('', v));
const pct = (v: ResultValue | undefined) => (num(v) === undefined ? '—' : formatPercent(num(v)!));

function effectPhrase(kind: CalculationKind, r: Record<string, ResultValue>): string {
  switch (kind) {
    case 'longitudinal-slopes':
      return `a difference in rates of change of ${show(r.slopeDifference)} per unit of time (SD ${show(r.sd)})`;
    case 'regression':
      return `an effect of f² = ${show(r.f2)}${num(r.slope) !== undefined ? ` (a slope of ${show(r.slope)})` : ''}`;
    case 'two-proportions':
    case 'cluster-proportions':
      return `a change from ${pct(r.p1)} to ${pct(r.p2)}`;
    case 'two-rates':
    case 'cluster-rates':
      return `a rate ratio of ${show(r.rateRatio)} (from ${show(r.baselineRate)} to ${show(r.treatedRate)} events per unit of follow-up time)`;
    default:
      return `a difference in means of ${show(r.delta)} (SD ${show(r.sd)})`;
  }
}

function sizePhrase(kind: CalculationKind, r: Record<string, ResultValue>): string {
  switch (kind) {
    case 'regression':
      return `${show(r.n)} units`;
    case 'cluster-means':
      return `${show(r.clustersPerArm)} clusters per arm of ${show(r.clusterSize)} units each`;
    case 'cluster-proportions':
      return `${show(r.clustersPerArm)} clusters per arm of ${show(r.clusterSize)} members each`;
    case 'cluster-rates':
      return `${show(r.clustersPerArm)} clusters per arm of ${show(r.clusterSize)} participants, each followed for ${show(r.exposure)} ${typeof r.exposure === 'number' ? nounFor(r.exposure, 'unit') : 'units'} of time`;
    default:
      return `${show(r.nPerGroup)} per group`;
  }
}

const MULTIPLICITY_WORDS: Record<string, string> = { bonferroni: 'Bonferroni', holm: 'the first step of Holm’s procedure' };

/**
 * The significance level the test is planned at: the adjusted one when several outcomes share
 * alpha ("alpha 0.025, i.e. 0.05 shared by 2 outcomes by Bonferroni"), never the nominal one alone.
 */
export function levelPhrase(r: Record<string, ResultValue>): string {
  const adjusted = num(r.alphaAdjusted);
  if (adjusted === undefined || adjusted === num(r.alpha)) return `alpha ${show(r.alpha)}`;
  const how = MULTIPLICITY_WORDS[String(r.multiplicity)] ?? String(r.multiplicity);
  return `alpha ${show(adjusted)} for each outcome (${show(r.alpha)} shared by ${show(r.outcomes)} outcomes, ${how})`;
}

const SIZE_KEYS = new Set(['nPerGroup', 'n', 'clustersPerArm', 'clusterSize']);

export function meaning(output: CalculationOutput): string {
  const r = output.result;
  const { kind, solvedFor } = output;
  const test = `${r.sides === 1 ? 'one-sided' : 'two-sided'} test at ${levelPhrase(r)}`;
  if (kind === 'design-effect') {
    const ess = num(r.effectiveSampleSize);
    return (
      `Clusters of ${show(r.clusterSize)} units with an ICC of ${show(r.icc)} inflate the variance of a mean ${show(r.designEffect)}-fold` +
      (ess !== undefined ? `: ${show(r.totalObservations)} units carry the information of ${formatNumber(ess, 4)} independent ones` : '') +
      `. A test that ignores the clusters would give false positives ${pct(r.naiveTypeIError)} of the time instead of ${pct(r.alpha)}.`
    );
  }
  if (kind === 'optimal-allocation') {
    const best = `Clusters of ${show(r.clusterSizeInteger)} units give the most information for the money (the unrounded optimum is ${show(r.clusterSize)})`;
    const powerPart = num(r.power) !== undefined ? `, with ${pct(r.power)} power to detect ${effectPhrase(kind, r)} by a ${test}` : '';
    if (num(r.clustersPerArm) === undefined) return `${best}. Give a budget to see the clusters it pays for, or a difference, SD and target power to see the budget they need.`;
    if (solvedFor === 'budget') return `${best}; ${show(r.clustersPerArm)} clusters per arm reach the target power for a budget of ${show(r.budget)}${powerPart}.`;
    return `${best}; a budget of ${show(r.budget)} pays for ${show(r.clustersPerArm)} clusters per arm${powerPart}.`;
  }
  if (!solvedFor) return '';
  const effect = effectPhrase(kind, r);
  const size = sizePhrase(kind, r);
  if (output.feasibility === 'already-met') {
    return `The target power of ${pct(r.targetPower)} is already met with ${size}, the smallest allowed: a ${test} has ${pct(r.power)} power to detect ${effect}.`;
  }
  if (output.feasibility === 'unreachable') {
    return SIZE_KEYS.has(solvedFor)
      ? `The target power of ${pct(r.targetPower)} is not reached even with ${size}, the largest allowed (power ${pct(r.power)}); the warning below says what would help.`
      : `No effect in the allowed range reaches the target power of ${pct(r.targetPower)} with ${size}; the nearest gives ${pct(r.power)}. The warning below says what would help.`;
  }
  if (solvedFor === 'power') return `With ${size}, a ${test} has ${pct(r.power)} power to detect ${effect}.`;
  if (SIZE_KEYS.has(solvedFor)) {
    return `With ${size}, a ${test} has ${pct(r.power)} power to detect ${effect}; the target was ${pct(r.targetPower)}.`;
  }
  return `With ${size}, a ${test} has ${pct(r.targetPower)} power to detect ${effect} or larger.`;
}
