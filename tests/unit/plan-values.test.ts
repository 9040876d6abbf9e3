/**
 * The Plan tab's fields start at the calculation's own defaults (the request schema in
 * lib/stats/calculations/request.ts), not at a copy of them.
 */
import { describe, expect, it } from 'vitest';
import { kindInfo } from '@/components/calculations/kinds';
import { initialValues } from '@/components/plan/values';
import { CALCULATION_KINDS, requestDefaults } from '@/lib/stats/calculations/request';

describe('the Plan form starts at the request schema’s defaults', () => {
  it('reads the defaults from the schema', () => {
    expect(requestDefaults('two-group-means')).toMatchObject({ alpha: 0.05, sides: 2, dropout: 0, outcomes: 1, multiplicity: 'none', ratio: 1 });
  });

  it.each(CALCULATION_KINDS)('%s', (kind) => {
    const defaults = requestDefaults(kind);
    const start = initialValues(kind, {});
    const shown = (kindInfo(kind)?.fields ?? []).filter((f) => f.name in defaults);
    expect(shown.map((f) => [f.name, start[f.name]])).toEqual(shown.map((f) => [f.name, typeof defaults[f.name] === 'boolean' ? defaults[f.name] : String(defaults[f.name])]));
  });

  it('keeps a value the plan gave', () => {
    expect(initialValues('two-group-means', { alpha: 0.01 }).alpha).toBe('0.01');
  });
});
