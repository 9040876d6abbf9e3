/**
 * The list of rules and `runChecks`, which runs them on a design and returns JSON-ready findings
 * (blocker → warning → advice; within a severity, in the order below) and the recommended
 * analysis. Rules are pure functions of the design; one that throws on an unforeseen design is
 * reported to `onRuleError` (by default logged) and skipped, so a save never fails on a check.
 */
import type { Design } from '@/lib/design/schema';
import { analysisMismatch } from './analysis-mismatch';
import { attrition } from './attrition';
import { baselineAdjustment } from './baseline-adjustment';
import { crossover } from './crossover';
import { fewUnits } from './few-units';
import { manyOccasions } from './many-occasions';
import { multiplicity } from './multiplicity';
import { narrowRange } from './narrow-range';
import { nestedClusters } from './nested-clusters';
import { outcomeFamily } from './outcome-family';
import { outliers } from './outliers';
import { perOccasion } from './per-occasion';
import { pairsAndBlocks } from './pairs-and-blocks';
import { pseudoreplication } from './pseudoreplication';
import { fallbackRecommendation, recommend } from './recommendation';
import { repeatedMeasures } from './repeated-measures';
import { sharedEnvironment } from './shared-environment';
import { skewedOutcome } from './skewed-outcome';
import { spatialSerial } from './spatial-serial';
import { unequalClusterSizes } from './unequal-cluster-sizes';
import { unequalVariance } from './unequal-variance';
import { uncertainIcc } from './uncertain-icc';
import { unitOfAnalysis } from './unit-of-analysis';
import type { CheckResult, Finding, Rule, Severity } from './types';

export const RULES: readonly Rule[] = [
  unitOfAnalysis,
  analysisMismatch,
  repeatedMeasures,
  perOccasion,
  nestedClusters,
  pseudoreplication,
  sharedEnvironment,
  fewUnits,
  crossover,
  uncertainIcc,
  unequalClusterSizes,
  manyOccasions,
  spatialSerial,
  outcomeFamily,
  skewedOutcome,
  unequalVariance,
  baselineAdjustment,
  pairsAndBlocks,
  attrition,
  multiplicity,
  outliers,
  narrowRange,
];

const ORDER: Record<Severity, number> = { blocker: 0, warning: 1, advice: 2 };

export interface RunOptions {
  /** Called when a rule throws; the rule's findings are left out. Default: log to the console. */
  onRuleError?: (ruleId: string, error: unknown) => void;
}

export function runChecks(design: Design, options: RunOptions = {}): CheckResult {
  const onError = options.onRuleError ?? ((id: string, e: unknown) => console.error(`rule ${id} failed`, e));
  const findings: Finding[] = [];
  for (const rule of RULES) {
    try {
      findings.push(...rule.check(design));
    } catch (e) {
      onError(rule.id, e);
    }
  }
  const sorted = findings.map((f, i) => ({ f, i })).sort((a, b) => ORDER[a.f.severity] - ORDER[b.f.severity] || a.i - b.i).map((x) => x.f);
  let recommendation;
  try {
    recommendation = recommend(design, sorted);
  } catch (e) {
    onError('recommendation', e);
    recommendation = fallbackRecommendation();
  }
  return { findings: sorted, recommendation };
}
