/**
 * Extreme calculation requests for property checks (fast-check): every kind, every quantity to
 * solve for, with inputs drawn across many orders of magnitude and at the edges of the schema's
 * ranges (effects of 1e-9 and 1e9, power of 0.0001 and 0.9999, ICC 0 and 1, 1,000,000 clusters).
 * Used by the unit property test (each call returns a finite answer or a clear error) and by
 * `npm run bench` (the time per call). Requests the schema refuses are dropped here: the schema
 * answers those with its own message.
 */
import fc from 'fast-check';
import { calculationSchema, SOLVABLE, type CalculationRequest } from './request';

/** Positive numbers from `min` to `max`, spread evenly over the orders of magnitude, with both ends. */
const magnitude = (min: number, max: number) =>
  fc.oneof(
    fc.constantFrom(min, max),
    fc.double({ min: Math.log10(min), max: Math.log10(max), noNaN: true }).map((e) => Number((10 ** e).toPrecision(6))),
  );
const effect = magnitude(1e-9, 1e9);
const sd = magnitude(1e-6, 1e6);
const unit = fc.oneof(fc.constantFrom(0.0001, 0.5, 0.9999), fc.double({ min: 0.0001, max: 0.9999, noNaN: true }));
const correlation = fc.oneof(fc.constantFrom(0, 0.999, 0.5), fc.double({ min: 0, max: 0.999, noNaN: true }));
const whole = (min: number, max: number) => fc.oneof(fc.constantFrom(min, max), fc.integer({ min, max }));
const power = fc.oneof(fc.constantFrom(0.06, 0.5, 0.8, 0.9999), fc.double({ min: 0.06, max: 0.9999, noNaN: true }));
const alpha = fc.constantFrom(0.05, 0.001, 0.5, 1e-6);
const sides = fc.constantFrom(1, 2);

/** One raw request (inputs of every quantity), the kind's quantity to solve for chosen among SOLVABLE. */
const raw = fc.oneof(
  fc.record({ kind: fc.constant('two-group-means'), delta: effect, sd, nPerGroup: whole(2, 10_000_000), ratio: magnitude(0.01, 100), power, alpha, sides }),
  fc.record({ kind: fc.constant('regression'), f2: magnitude(1e-9, 1e4), n: whole(3, 10_000_000), predictors: whole(1, 50), testedPredictors: fc.constant(1), power, alpha }),
  fc.record({ kind: fc.constant('cluster-means'), delta: effect, sd, icc: correlation, clusterSize: whole(1, 1_000_000), clustersPerArm: whole(2, 1_000_000), cv: fc.constantFrom(0, 0.5, 3), power, alpha, sides }),
  fc.record({ kind: fc.constant('repeated-measures'), delta: effect, sd, rho: correlation, baselines: whole(1, 20), followUps: whole(1, 20), analysis: fc.constantFrom('post', 'change', 'ancova'), nPerGroup: whole(2, 10_000_000), power, alpha, sides }),
  fc.record({ kind: fc.constant('longitudinal-slopes'), slopeDifference: effect, sd, rho: correlation, times: fc.constantFrom([0, 1], [0, 1, 2, 3, 4], [0, 1e-3], [0, 1e6]), nPerGroup: whole(2, 10_000_000), power, alpha, sides }),
  fc.record({ kind: fc.constant('two-proportions'), p1: unit, p2: unit, nPerGroup: whole(2, 10_000_000), power, alpha, sides, continuityCorrection: fc.boolean() }),
  fc.record({ kind: fc.constant('cluster-proportions'), p1: unit, p2: unit, icc: correlation, clusterSize: whole(1, 1_000_000), clustersPerArm: whole(2, 1_000_000), power, alpha, sides }),
  fc.record({ kind: fc.constant('two-rates'), baselineRate: magnitude(1e-6, 1e6), rateRatio: magnitude(1e-3, 1e3), exposure: magnitude(1e-3, 1e6), dispersion: fc.constantFrom(0, 1, 100), nPerGroup: whole(2, 10_000_000), power, alpha, sides }),
  fc.record({ kind: fc.constant('cluster-rates'), baselineRate: magnitude(1e-6, 1e6), rateRatio: magnitude(1e-3, 1e3), exposure: magnitude(1e-3, 1e6), clusterSize: whole(1, 1_000_000), clustersPerArm: whole(2, 1_000_000), betweenClusterCv: fc.constantFrom(0, 0.25, 3), power, alpha, sides }),
  fc.record({ kind: fc.constant('optimal-allocation'), icc: fc.double({ min: 1e-6, max: 0.999, noNaN: true }), costPerCluster: magnitude(1e-3, 1e9), costPerUnit: magnitude(1e-3, 1e9), delta: effect, sd, power, alpha, sides }),
);

/** A request the schema accepts, with one quantity left to solve (when the kind solves one). */
export const extremeRequest: fc.Arbitrary<CalculationRequest> = raw
  .chain((r) => {
    const solvable = SOLVABLE[r.kind as CalculationRequest['kind']];
    return solvable.length === 0 ? fc.constant({ ...r }) : fc.constantFrom(...solvable).map((solveFor) => ({ ...r, solveFor }));
  })
  .map((r) => calculationSchema.safeParse(r))
  .filter((p) => p.success)
  .map((p) => p.data!);
