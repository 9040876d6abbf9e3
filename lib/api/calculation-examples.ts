/**
 * One example request per calculation kind, from the invented Harrow Vale demo (PRODUCT.md):
 * the classroom reading programme, the greenhouse trial with plants sharing trays and the
 * sleep-timing study with 8 nights per volunteer. The OpenAPI document shows each with the
 * answer the engine gives for it (computed when the document is built, never written by hand);
 * the calculator pages start from the same values.
 */
import type { z } from 'zod';
import type { CalculationKind, calculationSchema } from '@/lib/stats/calculations/request';

export type CalculationInput = z.input<typeof calculationSchema>;

export interface CalculationExample {
  summary: string;
  request: CalculationInput;
}

export const CALCULATION_EXAMPLES: Record<CalculationKind, CalculationExample> = {
  'two-group-means': {
    summary: 'Reading programme, pupils randomised one by one: pupils per group to detect 3 points (SD 10) with 80% power',
    request: { kind: 'two-group-means', delta: 3, sd: 10, alpha: 0.05, power: 0.8 },
  },
  regression: {
    summary: 'Greenhouse trial: plants needed to detect a slope of 0.5 cm of growth per hour of light among 3 predictors',
    request: { kind: 'regression', slope: 0.5, sdX: 4, residualSd: 10, testedPredictors: 1, predictors: 3, alpha: 0.05, power: 0.8 },
  },
  'cluster-means': {
    summary: 'Reading programme randomised by classroom: classrooms per arm for 4 points (SD 12), ICC 0.15, 25 pupils per class',
    request: { kind: 'cluster-means', delta: 4, sd: 12, icc: 0.15, clusterSize: 25, cv: 0.3, alpha: 0.05, power: 0.8, dropout: 0.1 },
  },
  'repeated-measures': {
    summary: 'Sleep-timing study: volunteers per group, 2 baseline and 6 follow-up nights, ANCOVA on reaction time',
    request: { kind: 'repeated-measures', delta: 20, sd: 60, rho: 0.6, baselines: 2, followUps: 6, analysis: 'ancova', alpha: 0.05, power: 0.9 },
  },
  'longitudinal-slopes': {
    summary: 'Sleep-timing study: power to detect a difference of 3 ms per night in the rate of change over 8 nights, 40 volunteers per group',
    request: { kind: 'longitudinal-slopes', slopeDifference: 3, sd: 60, rho: 0.6, times: [1, 2, 3, 4, 5, 6, 7, 8], nPerGroup: 40, alpha: 0.05 },
  },
  'two-proportions': {
    summary: 'Reading programme, pupils randomised one by one: pupils per group to raise the share reading at the expected level from 55% to 70%',
    request: { kind: 'two-proportions', p1: 0.55, p2: 0.7, alpha: 0.05, power: 0.8 },
  },
  'cluster-proportions': {
    summary: 'Reading programme randomised by classroom: classrooms per arm to raise the share reading at the expected level from 55% to 70%, about 25 pupils per class (CV 0.3), ICC 0.05',
    request: { kind: 'cluster-proportions', p1: 0.55, p2: 0.7, icc: 0.05, clusterSize: 25, cv: 0.3, alpha: 0.05, power: 0.8 },
  },
  'two-rates': {
    summary: 'Sleep-timing study: volunteers per group to detect 20% fewer night-time awakenings (1.5 a night without the change, 8 nights each, dispersion 0.3)',
    request: { kind: 'two-rates', baselineRate: 1.5, rateRatio: 0.8, exposure: 8, dispersion: 0.3, alpha: 0.05, power: 0.8 },
  },
  'cluster-rates': {
    summary: 'Reading programme randomised by classroom: classrooms per arm to cut absences by 25% (0.5 days a pupil-month, 6 months, 25 pupils per class, CV between classrooms 0.25)',
    request: { kind: 'cluster-rates', baselineRate: 0.5, rateRatio: 0.75, exposure: 6, clusterSize: 25, betweenClusterCv: 0.25, alpha: 0.05, power: 0.8 },
  },
  'design-effect': {
    summary: 'Greenhouse trial: 12 plants share each tray, ICC 0.3 — what 288 plants are worth and how often a plant-level test would be wrong',
    request: { kind: 'design-effect', icc: 0.3, clusterSize: 12, cv: 0, totalObservations: 288, alpha: 0.05 },
  },
  'optimal-allocation': {
    summary: 'Reading programme: pupils per classroom and classrooms for a budget of 60,000 when a classroom costs 1,200 and a pupil 40',
    request: { kind: 'optimal-allocation', icc: 0.15, costPerCluster: 1200, costPerUnit: 40, budget: 60000 },
  },
};
