/**
 * Plain-language sentences about the results of a stress test, written only where a measure
 * departs from what the analysis promises by more than about 3 Monte Carlo SEs:
 *
 * - typeIError against α: "With skewed errors, analysed with ols, the false-positive rate is
 *   25%, not 5%.";
 * - coverage against 1 − α: "…, the 95% confidence interval covers the true effect 83% of the
 *   time, not 95%.";
 * - bias against 0: "…, the estimate is off by 0.12 on average (40% of the true effect).";
 * - seRatio against 1: "…, the reported standard error is 35% smaller than the real spread of
 *   the estimates.";
 * - nonConverged, whenever it is above 0, as a count and a share of the fits the run asked for
 *   (each replicate is fitted twice: with the planned effect and at zero effect): "…, 12 of the
 *   2,000 fits asked for (0.6%; 1,000 replicates, each fitted with and without the effect) did
 *   not converge or could not be estimated, and were left out of the other figures." When every
 *   fit failed the sentence ends "…, so this analysis has no figures here." instead.
 *
 * The yardstick is 3·max(reported MC SE, the MC SE the nominal value would have,
 * √(p₀(1 − p₀)/replicates)), so that an observed rate of exactly 0 or 1, whose own MC SE is 0,
 * is not called a departure on a handful of replicates. Power has no nominal value and gets no
 * sentence. (MC SEs: Morris, White & Crowther 2019, Stat Med 38:2074.)
 */
import { analysisLabel } from './analysis-words';
import { formatCount, formatNumber, formatPercent } from '@/lib/format';
import type { AnalysisName } from '@/lib/models/types';
import { scenarioKey, type Scenario, type SimulationSpec } from './spec';
import type { Metric } from './metrics';
import type { SimulationResults } from './run';

/** How many Monte Carlo SEs count as a departure. */
export const DEPARTURE_MCSE = 3;

const SCENARIO_PHRASES: Record<Scenario['violation'], string> = {
  none: 'When the assumptions hold',
  skewed: 'With skewed errors',
  'heavy-tailed': 'With heavy-tailed errors',
  outliers: 'With outliers',
  'unequal-variance': 'With unequal variances',
  nonlinear: 'With a curved relation',
  serial: 'With serial correlation',
  'carry-over': 'With carry-over between periods',
};

/** 0.25 → "25%", 0.051 → "5.1%", 0.0004 → "0.04%" (lib/format.ts). */
export function percent(p: number): string {
  return formatPercent(p, 'text');
}

function departs(metric: Metric, nominal: number, nominalMcse: number): boolean {
  if (!Number.isFinite(metric.value)) return false;
  return Math.abs(metric.value - nominal) > DEPARTURE_MCSE * Math.max(metric.mcse, nominalMcse);
}

function scenarioPhrase(scenario: Scenario): string {
  const phrase = SCENARIO_PHRASES[scenario.violation];
  const name = scenarioKey(scenario);
  return name === scenario.violation ? phrase : `${phrase} (${name})`;
}

/** "12 of the 2,000 fits asked for (0.6%; 1,000 replicates, each fitted with and without the effect) did not converge …". */
function nonConvergedClause(failed: number, replicates: number): string {
  const asked = 2 * replicates;
  const head = `${formatCount(failed)} of the ${formatCount(asked)} fits asked for (${percent(failed / asked)}; ${formatCount(replicates)} replicates, each fitted with and without the effect) did not converge or could not be estimated`;
  return failed >= asked ? `${head}, so this analysis has no figures here.` : `${head}, and were left out of the other figures.`;
}

/** The sentences for every scenario × analysis of `results`, in the specification's order. */
export function summarise(spec: SimulationSpec, results: SimulationResults): string[] {
  const sentences: string[] = [];
  const { alpha, replicates } = spec;
  const effect = spec.truth.effect;
  const level = percent(1 - alpha);
  const rateMcse = (p: number) => Math.sqrt((p * (1 - p)) / replicates);
  for (const scenario of spec.scenarios) {
    const byAnalysis = results[scenarioKey(scenario)];
    if (!byAnalysis) continue;
    for (const analysis of spec.analyses) {
      const m = byAnalysis[analysis as AnalysisName];
      if (!m) continue;
      const lead = `${scenarioPhrase(scenario)}, analysed with ${analysisLabel(analysis)}`;
      if (departs(m.typeIError, alpha, rateMcse(alpha))) {
        sentences.push(`${lead}, the false-positive rate is ${percent(m.typeIError.value)}, not ${percent(alpha)}.`);
      }
      if (departs(m.coverage, 1 - alpha, rateMcse(1 - alpha))) {
        sentences.push(`${lead}, the ${level} confidence interval covers the true effect ${percent(m.coverage.value)} of the time, not ${level}.`);
      }
      if (departs(m.bias, 0, 0)) {
        const share = effect !== 0 ? ` (${percent(Math.abs(m.bias.value / effect))} of the true effect)` : '';
        sentences.push(`${lead}, the estimate is off by ${formatNumber(m.bias.value, 2)} on average${share}.`);
      }
      if (departs(m.seRatio, 1, 0)) {
        const change = m.seRatio.value - 1;
        sentences.push(
          `${lead}, the reported standard error is ${percent(Math.abs(change))} ${change < 0 ? 'smaller' : 'larger'} than the real spread of the estimates.`,
        );
      }
      if (m.nonConverged.value > 0) sentences.push(`${lead}, ${nonConvergedClause(m.nonConverged.value, replicates)}`);
    }
  }
  return sentences;
}
