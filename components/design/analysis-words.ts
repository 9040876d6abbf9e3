/**
 * The analysis plan's choices in words: what the Analysis step offers and what the Checks tab's
 * recommended analysis shows, so that no id of the design model (kenward-roger, hc3,
 * negative-binomial) reaches the screen. The words of the design's own choices live with its
 * fields (lib/design/fields.ts), which a comparison of versions reads too.
 */
import type { Recommendation } from '@/lib/rules/types';

export { DF_METHOD_WORDS, GLM_FAMILY_WORDS, optionsOf, STANDARD_ERROR_WORDS } from '@/lib/design/fields';

export const LINK_WORDS: Record<NonNullable<Recommendation['link']>, string> = {
  identity: 'identity link',
  logit: 'logit link',
  log: 'log link',
};
