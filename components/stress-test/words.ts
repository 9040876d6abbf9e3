/**
 * The Stress test tab's words: each scenario (one broken assumption with its parameters) and each
 * analysis in plain words, and how a metric with its Monte Carlo SE is written
 * ("81.2% ± 1.2%"). Shared by the form, the results table, the charts and their summaries.
 */
import { formatNumber, formatPercent } from '@/lib/format';
import type { AnalysisName } from '@/lib/models/types';
import type { Scenario, Violation } from '@/lib/sim/spec';
import type { CellVerdict } from '@/lib/sim/verdict';

export const VIOLATIONS = ['none', 'skewed', 'heavy-tailed', 'outliers', 'unequal-variance', 'nonlinear', 'serial', 'carry-over'] as const satisfies readonly Violation[];

export const VIOLATION_TITLES: Record<Violation, string> = {
  none: 'Assumptions hold',
  skewed: 'Right-skewed errors',
  'heavy-tailed': 'Heavy-tailed errors',
  outliers: 'Outliers',
  'unequal-variance': 'Unequal variance',
  nonlinear: 'Curved relation',
  serial: 'Serial correlation between occasions',
  'carry-over': 'Carry-over from the previous period',
};

function num(x: number): string {
  return formatNumber(x, 4);
}

/** "Heavy-tailed errors (t with 3 df)": the scenario with its parameters, in plain words. */
export function describeScenario(s: Scenario): string {
  switch (s.violation) {
    case 'none':
      return 'Assumptions hold (data as the design describes them)';
    case 'skewed':
      return `Right-skewed errors (log-normal with σ of the log ${num(s.sigmaLog)}, same SD)`;
    case 'heavy-tailed':
      return `Heavy-tailed errors (t with ${num(s.df)} df, same SD)`;
    case 'outliers':
      return `Outliers (${num(s.fraction * 100)}% of errors multiplied by ${num(s.scale)})`;
    case 'unequal-variance':
      if (s.model === 'arm') return `Unequal variance (SD in arm 2 is ${num(s.sdRatio)} × arm 1)`;
      return `Unequal variance (SD grows with the ${s.model}, ratio ${num(s.sdRatio)})`;
    case 'nonlinear':
      return `Curved relation (${s.shape} in ${s.on ?? 'time or a covariate'}, rising ${num(s.strength)} SD, fitted as a line)`;
    case 'serial':
      return `Serial correlation between occasions (AR(1) with ρ = ${num(s.ar)})`;
    case 'carry-over':
      return s.size !== undefined
        ? `Carry-over: the second arm's treatment adds ${num(s.size)} in the period after it`
        : `Carry-over: ${num(s.fraction * 100)}% of the effect persists into the period after the second arm`;
  }
}

export const ANALYSIS_TITLES: Record<AnalysisName, string> = {
  ols: 'Least squares, model-based SE (ignores clustering)',
  'ols-hc3': 'Least squares with HC3 robust SE',
  'cluster-robust': 'CR2 cluster-robust SE, small-sample df',
  'cluster-means': 'Analysis of cluster or unit means',
  mixed: 'Linear mixed model (REML, random intercepts)',
  huber: 'Huber M-estimation (k = 1.345), sandwich SE',
  'log-ols': 'Least squares on the log outcome (effect as a ratio)',
  glm: 'Logistic or Poisson regression',
  'glm-nb': 'Negative-binomial regression for overdispersed counts',
  glmm: 'Logistic or Poisson mixed model with a random intercept',
  'period-difference': 't test on the differences between the two periods (AB/BA cross-over)',
};

export interface MetricValue {
  value: number | null;
  mcse: number | null;
}

/** The columns of the results table, in order; `rate` metrics are shown as percentages. */
export const RESULT_COLUMNS = [
  { key: 'power', label: 'Power', rate: true },
  { key: 'typeIError', label: 'False-positive rate', rate: true },
  { key: 'coverage', label: 'Coverage', rate: true },
  { key: 'bias', label: 'Bias', rate: false },
  { key: 'seRatio', label: 'SE ratio', rate: false },
  { key: 'ciWidth', label: 'CI width', rate: false },
  { key: 'nonConverged', label: 'Failed fits', rate: false },
] as const;
export type ResultColumn = (typeof RESULT_COLUMNS)[number]['key'];

export function formatRate(p: number | null | undefined): string {
  return formatPercent(p);
}

function formatPlain(x: number | null | undefined): string {
  return x === null || x === undefined ? '—' : formatNumber(x, 3);
}

/** "81.2% ± 1.2%" for a rate, "0.012 ± 0.031" otherwise; "—" where the value is missing. */
export function formatMetric(m: MetricValue | undefined, rate: boolean): string {
  if (!m || m.value === null || !Number.isFinite(m.value)) return '—';
  const value = rate ? formatRate(m.value) : formatPlain(m.value);
  if (m.mcse === null || !Number.isFinite(m.mcse)) return value;
  return `${value} ± ${rate ? formatRate(m.mcse) : formatPlain(m.mcse)}`;
}

/** "12 of 2,000 (0.6%)": failed fits against the fits asked for (two per replicate: with and without the effect). */
export function formatFailedFits(m: MetricValue | undefined, replicates: number): string {
  if (!m || m.value === null || !Number.isFinite(m.value)) return '—';
  const asked = 2 * replicates;
  return `${formatNumber(m.value)} of ${formatNumber(asked)} (${formatRate(m.value / asked)})`;
}

/** Monte Carlo SE of an estimated rate p over R replicates, √(p(1 − p)/R) (Morris, White & Crowther 2019, Stat Med 38:2074). */
export function rateMcse(p: number, replicates: number): number {
  return Math.sqrt((p * (1 - p)) / replicates);
}

/** Word, icon and colour of each cell verdict: the word and the icon carry it, the colour repeats it (AA on its tint). */
export const VERDICT_LOOK: Record<CellVerdict, { word: string; icon: string; tone: string }> = {
  holds: { word: 'Holds', icon: '✓', tone: 'border-ok bg-ok-light text-ok' },
  underpowered: { word: 'Holds, low power', icon: '↓', tone: 'border-caution bg-caution-light text-caution' },
  caution: { word: 'Slightly off', icon: '!', tone: 'border-caution bg-caution-light text-caution' },
  // Neutral, with a dashed border: not a pass, not a failure.
  undecided: { word: 'Too few runs to tell', icon: '?', tone: 'border-dashed border-muted bg-white text-ink' },
  broken: { word: 'Fails', icon: '✕', tone: 'border-danger bg-danger-light text-danger' },
  'no-result': { word: 'No result', icon: '–', tone: 'border-line bg-white text-muted' },
};
