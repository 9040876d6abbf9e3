/**
 * No input freezes the page (issue 11 point 11): time per call over extreme inputs of every kind
 * (fast-check, fixed seed; lib/stats/calculations/extreme-requests.ts) — the calculation the
 * calculators and the API run, and the power curve the Plan tab draws from it. Reported, not
 * asserted: the slowest call against a bound of 1 s per call (a page must answer at once; the
 * API's request budget is far larger), with the request that took it.
 */
import fc from 'fast-check';
import { curveSizes } from '@/lib/plan/sensitivity';
import { calculate } from '@/lib/stats/calculations';
import { CalculationInputError } from '@/lib/stats/calculations/errors';
import { extremeRequest } from '@/lib/stats/calculations/extreme-requests';
import { CURVE_SIZE, powerCurve } from '@/lib/stats/calculations/sensitivity';
import type { CalculationOutput } from '@/lib/stats/calculations/types';
import type { Throughput, ThroughputResult } from './run';

const BOUND_MS = 1000;
const SAMPLES = 3000;

function timeEach(name: string, requests: readonly unknown[], call: (request: never) => unknown): ThroughputResult {
  const times: number[] = [];
  let slowest = { ms: 0, request: '' };
  let errors = 0;
  for (const request of requests) {
    const t0 = process.hrtime.bigint();
    try {
      call(request as never);
    } catch (e) {
      if (!(e instanceof CalculationInputError)) throw e;
      errors++;
    }
    const ms = Number(process.hrtime.bigint() - t0) / 1e6;
    times.push(ms);
    if (ms > slowest.ms) slowest = { ms, request: JSON.stringify(request) };
  }
  times.sort((a, b) => a - b);
  const at = (q: number) => times[Math.min(times.length - 1, Math.ceil(q * times.length) - 1)]!;
  return {
    name,
    calls: times.length,
    clearErrors: errors,
    meanMs: Number((times.reduce((s, x) => s + x, 0) / times.length).toFixed(3)),
    p99Ms: Number(at(0.99).toFixed(2)),
    maxMs: Number(times.at(-1)!.toFixed(2)),
    boundMs: BOUND_MS,
    withinBound: times.at(-1)! <= BOUND_MS,
    slowest: slowest.request,
  };
}

export const throughput: Throughput[] = [
  {
    name: `calculate: ${SAMPLES} extreme requests, every kind (fast-check, seed 11)`,
    run: () => timeEach(`calculate over ${SAMPLES} extreme requests`, fc.sample(extremeRequest, { seed: 11, numRuns: SAMPLES }), calculate),
  },
  {
    name: 'Plan power curve over extreme requests',
    run: () => {
      const requests = fc.sample(extremeRequest, { seed: 12, numRuns: 500 }).filter((r) => CURVE_SIZE[r.kind] !== undefined && (r as { solveFor?: string }).solveFor !== 'power');
      return timeEach(`calculate + 40-point power curve over ${requests.length} extreme requests`, requests, (request) => {
        const out: CalculationOutput = calculate(request);
        const size = Number(out.result[CURVE_SIZE[(request as { kind: keyof typeof CURVE_SIZE }).kind]!]);
        return powerCurve(request, curveSizes([size]));
      });
    },
  },
];
