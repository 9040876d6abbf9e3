/**
 * The analysis plan's choices in words: what the Analysis step offers and what the Checks tab's
 * recommended analysis shows, from one table, so that no id of the design model (kenward-roger,
 * hc3, negative-binomial) reaches the screen.
 */
import type { Analysis } from '@/lib/design/schema';
import type { Recommendation } from '@/lib/rules/types';

export const GLM_FAMILY_WORDS: Record<NonNullable<Analysis['glmFamily']>, string> = {
  gaussian: 'Gaussian',
  binomial: 'Binomial (logistic)',
  poisson: 'Poisson',
  'negative-binomial': 'Negative binomial',
  gamma: 'Gamma',
  beta: 'Beta',
};

export const STANDARD_ERROR_WORDS: Record<Analysis['standardErrors'], string> = {
  model: 'From the model',
  hc3: 'Robust (HC3)',
  'cluster-robust': 'Cluster-robust',
  cr2: 'Cluster-robust, small-sample (CR2)',
};

export const DF_METHOD_WORDS: Record<Analysis['dfMethod'], string> = {
  residual: 'Residual',
  satterthwaite: 'Satterthwaite',
  'kenward-roger': 'Kenward–Roger',
  'between-within': 'Between–within',
};

export const LINK_WORDS: Record<NonNullable<Recommendation['link']>, string> = {
  identity: 'identity link',
  logit: 'logit link',
  log: 'log link',
};

/** The options of a select, in the table's order. */
export function optionsOf<K extends string>(words: Record<K, string>): [K, string][] {
  return Object.entries(words) as [K, string][];
}
