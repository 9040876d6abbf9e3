/**
 * Adjustments shared by every calculation: the significance level for several primary outcomes
 * (multiplicity) and the inflation of analysed numbers to numbers to recruit (attrition).
 */
import { HOLM_1979 } from '@/lib/citations';
import type { Citation } from '@/lib/citations';
import { formatNumber, SENTENCE_DIGITS } from '@/lib/format';

export type Multiplicity = 'none' | 'bonferroni' | 'holm';

export interface AdjustedAlpha {
  /** The level each outcome is planned at. */
  alphaAdjusted: number;
  warnings: string[];
  references: Citation[];
}

/**
 * The level each of K primary outcomes is planned at: α/K for Bonferroni; for Holm's step-down
 * procedure also α/K, the level of its first and most stringent step (Holm 1979), which is the
 * common way to plan a study analysed with Holm's procedure: its later steps are less
 * stringent, so the plan is conservative for every outcome but the one with the smallest
 * p-value. K = 1 or 'none' leaves α as it is.
 *
 * Valid range: 0 < α ≤ 0.5, K a whole number ≥ 1 (the schema's bounds). Exact up to one division.
 */
export function adjustAlpha(alpha: number, outcomes: number, multiplicity: Multiplicity): AdjustedAlpha {
  const warnings: string[] = [];
  const references: Citation[] = [];
  if (outcomes <= 1 || multiplicity === 'none') {
    if (outcomes > 1) {
      warnings.push(
        `${outcomes} primary outcomes are each tested at alpha = ${alpha} without adjustment: the chance of at least one false positive is higher than ${alpha}.`,
      );
    }
    return { alphaAdjusted: alpha, warnings, references };
  }
  const alphaAdjusted = alpha / outcomes;
  if (multiplicity === 'bonferroni') {
    warnings.push(`Bonferroni adjustment for ${outcomes} primary outcomes: each is planned at alpha = ${alpha}/${outcomes} = ${formatNumber(alphaAdjusted, SENTENCE_DIGITS)}.`);
  } else {
    warnings.push(
      `Holm adjustment for ${outcomes} primary outcomes: the calculation plans at alpha = ${alpha}/${outcomes} = ${formatNumber(alphaAdjusted, SENTENCE_DIGITS)}, ` +
        'the level of Holm’s first and most stringent step. This is common practice; it is conservative, since the later steps test at larger levels.',
    );
    references.push(HOLM_1979);
  }
  return { alphaAdjusted, warnings, references };
}

/**
 * The smallest whole number ≥ x. x is first rounded to 12 significant digits, so a quotient
 * that lands one unit in the last place above a whole number (100/(1 − 0.2) or 0.1·30) is
 * not pushed up to the next one.
 */
export function roundUp(x: number): number {
  return Math.ceil(Number(x.toPrecision(12)));
}

/**
 * The number to recruit so that `analysed` remain when a share d is lost: ⌈analysed/(1 − d)⌉.
 * Valid range: analysed ≥ 0, 0 ≤ d < 1.
 */
export function toRecruit(analysed: number, dropout: number): number {
  return dropout === 0 ? analysed : roundUp(analysed / (1 - dropout));
}

/** The attrition sentence, or nothing when no loss is expected. */
export function dropoutWarning(dropout: number, what: string): string[] {
  return dropout > 0
    ? [`Recruitment is inflated by 1/(1 − ${dropout}) for an expected loss of ${formatNumber(dropout * 100, SENTENCE_DIGITS)}% of ${what}, rounded up.`]
    : [];
}
