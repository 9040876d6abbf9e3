/**
 * No input freezes the page (issue 11 point 11): over extreme inputs of every kind (effects of
 * 1e-9 to 1e9, power up to 0.9999, alpha down to 1e-6, a million clusters), every calculation
 * returns a finite answer with its feasibility, or a CalculationInputError that says what to
 * change — never another exception, NaN or Infinity. Time per call is reported by
 * `npm run bench` (tests/bench/extremes.bench.ts), not asserted here.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { CalculationInputError } from './errors';
import { extremeRequest } from './extreme-requests';
import { calculate } from './index';
import { calculationSchema, SOLVABLE } from './request';

describe('extreme inputs: a finite answer or a clear error', () => {
  it('every kind, every quantity solved for', () => {
    fc.assert(
      fc.property(extremeRequest, (request) => {
        let out: ReturnType<typeof calculate>;
        try {
          out = calculate(request);
        } catch (e) {
          expect(e, JSON.stringify(request)).toBeInstanceOf(CalculationInputError);
          expect((e as CalculationInputError).message.length).toBeGreaterThan(10);
          return;
        }
        const solved = out.solvedFor ?? (SOLVABLE[request.kind].length === 0 ? 'clusterSizeInteger' : undefined);
        if (request.kind !== 'design-effect') {
          expect(Number.isFinite(out.result[solved!] as number), `${JSON.stringify(request)} → ${solved} = ${String(out.result[solved!])}`).toBe(true);
        }
        const power = out.result.power;
        if (typeof power === 'number') expect(power >= 0 && power <= 1, `${JSON.stringify(request)} → power ${power}`).toBe(true);
        expect(['ok', 'already-met', 'unreachable']).toContain(out.feasibility);
      }),
      { seed: 20261203, numRuns: 200 },
    );
  });

  it('a difference of 1e9 with SD 1 is already met with 2 per group, and says so', () => {
    const out = calculate(calculationSchema.parse({ kind: 'two-group-means', delta: 1e9, sd: 1, power: 0.8 }));
    expect(out.feasibility).toBe('already-met');
    expect(out.result.nPerGroup).toBe(2);
    expect(out.warnings.join(' ')).toContain('already reached with the smallest allowed number of units in group 1 (2)');
  });
});
