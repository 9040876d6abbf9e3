import { describe, expect, it } from 'vitest';
import { ANALYSIS_NAMES } from '@/lib/models/types';
import { ANALYSIS_LABELS } from './analysis-words';

describe('the analyses in words', () => {
  /** The ids that are no English words ("mixed", "cluster-robust" are). */
  const JARGON = ANALYSIS_NAMES.filter((id) => !['mixed', 'cluster-robust', 'huber'].includes(id));

  it.each(ANALYSIS_NAMES)('%s has a name without any analysis id in it', (name) => {
    const words = ANALYSIS_LABELS[name];
    const ids = JARGON.filter((id) => new RegExp(`(^|[^\\w-])${id}($|[^\\w-])`).test(words));
    expect(ids, words).toEqual([]);
  });
});
