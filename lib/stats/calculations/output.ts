/**
 * Pieces every calculation's output shares: references as full citations, the sentences for
 * impossible targets, and the attrition and multiplicity fields of `result`.
 */
import { uniqueCitations } from '@/lib/citations';
import type { Citation } from '@/lib/citations';
import { dropoutWarning, toRecruit } from './adjust';
import type { Feasibility } from './types';
import { formatNumber, SENTENCE_DIGITS } from '@/lib/format';

export function fullReferences(list: readonly Citation[]): string[] {
  return uniqueCitations(list).map((c) => c.full);
}

/**
 * The sentence for a size that is 'already-met' or 'unreachable' (none for 'ok').
 * `what` names the size ('participants per group'), `limit` the size reported.
 */
export function sizeFeasibilityWarning(feasibility: Feasibility, what: string, size: number, power: number, target: number): string[] {
  if (feasibility === 'already-met') {
    return [
      `The target power ${formatNumber(target, SENTENCE_DIGITS)} is already reached with the smallest allowed number of ${what} (${size}), ` +
        `which gives power ${formatNumber(power, SENTENCE_DIGITS)}.`,
    ];
  }
  if (feasibility === 'unreachable') {
    return [
      `No number of ${what} up to the largest allowed (${formatNumber(size, SENTENCE_DIGITS)}) reaches power ${formatNumber(target, SENTENCE_DIGITS)}; ` +
        `that many give power ${formatNumber(power, SENTENCE_DIGITS)}. Consider a larger effect, fewer outcomes or a different design.`,
    ];
  }
  return [];
}

export function effectFeasibilityWarning(feasibility: Feasibility, what: string, effect: number, power: number, target: number): string[] {
  return feasibility === 'unreachable'
    ? [
        `No ${what} in the allowed range reaches power ${formatNumber(target, SENTENCE_DIGITS)}; the nearest, ${formatNumber(effect, SENTENCE_DIGITS)}, gives power ${formatNumber(power, SENTENCE_DIGITS)}. ` +
          'Increase the sample size.',
      ]
    : [];
}

export const TWO_SIDED = (sides: 1 | 2) => (sides === 2 ? 'two-sided' : 'one-sided');

export interface TestSettings {
  alpha: number;
  alphaAdjusted: number;
  outcomes: number;
  multiplicity: string;
  /** The achieved power (at the solved size or effect, or the one computed). */
  power: number;
  /** The requested power, or null when power was what was solved for. */
  targetPower: number | null;
}

/** The significance and power part of every `result`, under the API's names. */
export function testSettings(settings: TestSettings): Record<string, number | string | null> {
  const { alpha, alphaAdjusted, outcomes, multiplicity, power, targetPower } = settings;
  return { alpha, alphaAdjusted, outcomes, multiplicity, power, targetPower };
}

export interface ClusterRecruitment {
  /** The attrition part of a cluster kind's `result`, under the API's names. */
  result: Record<string, number>;
  warnings: string[];
}

/**
 * Numbers to recruit for k clusters per arm of m members: m inflated for members lost within
 * clusters (`dropout`), k for whole clusters lost (`clusterDropout`), each rounded up; and the
 * sentences that say so. `members` names them ('units', 'participants').
 */
export function clusterRecruitment(clustersPerArm: number, clusterSize: number, dropout: number, clusterDropout: number, members: string): ClusterRecruitment {
  const kRecruit = toRecruit(clustersPerArm, clusterDropout);
  const mRecruit = toRecruit(clusterSize, dropout);
  return {
    result: {
      dropout,
      clusterDropout,
      clusterSizeToRecruit: mRecruit,
      clustersPerArmToRecruit: kRecruit,
      totalAnalysed: 2 * clustersPerArm * clusterSize,
      totalToRecruit: 2 * kRecruit * mRecruit,
    },
    warnings: [
      ...dropoutWarning(dropout, `${members} within each cluster`),
      ...(clusterDropout > 0 ? [`Clusters to recruit are inflated by 1/(1 − ${clusterDropout}) for whole clusters expected to drop out, rounded up.`] : []),
    ],
  };
}
