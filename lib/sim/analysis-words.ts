/**
 * The analyses the stress test compares, by name in plain words. Their ids (lib/models/types.ts)
 * stay in the API and the stored runs; whatever a reader sees — the form, the results, the charts,
 * the summary sentences and the messages of a refused specification — names them this way.
 */
import type { AnalysisName } from '@/lib/models/types';

export const ANALYSIS_LABELS: Record<AnalysisName, string> = {
  ols: 'least squares',
  'ols-hc3': 'least squares with robust SE (HC3)',
  'cluster-robust': 'cluster-robust SE (CR2)',
  'cluster-means': 'analysis of cluster or unit means',
  mixed: 'linear mixed model',
  huber: 'Huber robust regression',
  'log-ols': 'least squares on the log outcome',
  glm: 'logistic or Poisson regression',
  'glm-nb': 'negative-binomial regression',
  glmm: 'logistic or Poisson mixed model',
  'period-difference': 't test on the period differences',
};

/** "least squares" for "ols"; an unknown id is returned as it is. */
export function analysisLabel(name: string): string {
  return ANALYSIS_LABELS[name as AnalysisName] ?? name;
}
