/**
 * The words a finding's numbers and prose are shown with on the Checks tab. The rules name their
 * numbers by code keys (`naiveTypeIError`, `sizeCv`); a researcher reads the label beside each.
 */
import { formatNumber, formatPercent } from '@/lib/format';

/** Plain words for every number a rule reports (tests/unit/finding-numbers.test.ts keeps it complete). */
export const NUMBER_LABELS: Record<string, string> = {
  alpha: 'significance level',
  allocationRatio: 'allocation ratio',
  analysedUnits: 'units analysed',
  ancovaVarianceFactor: 'variance factor with ANCOVA',
  betweenUnitDf: 'degrees of freedom between units',
  changeScoreVarianceFactor: 'variance factor of change scores',
  clusters: 'clusters',
  clustersForSamePrecision: 'clusters for the same precision',
  completeCases: 'complete cases',
  correlation: 'correlation',
  correlationAtMaxLag: 'correlation at the largest lag',
  correlationHigh: 'correlation, high',
  correlationLow: 'correlation, low',
  designDf: 'degrees of freedom the design gives',
  designEffect: 'design effect',
  designEffectBetween: 'design effect between units',
  designEffectBetweenHigh: 'design effect between units, high',
  designEffectBetweenLow: 'design effect between units, low',
  designEffectEqualSizes: 'design effect with equal sizes',
  designEffectHigh: 'design effect, high',
  designEffectLow: 'design effect, low',
  dispersion: 'overdispersion',
  effectiveN: 'effective sample size',
  effectiveNBetween: 'effective sample size between units',
  effectiveReplicatesPerUnit: 'effective replicates per unit',
  experimentalUnits: 'experimental units',
  extraInflation: 'extra inflation from unequal sizes',
  familyWiseError: 'chance of at least one false positive',
  finalAttrition: 'attrition by the last occasion',
  icc: 'ICC',
  iccHigh: 'ICC, high',
  iccLow: 'ICC, low',
  lag1Correlation: 'correlation of neighbours',
  maxLag: 'largest lag',
  meanClusterSize: 'mean cluster size',
  meanCount: 'mean count',
  measurements: 'measurements',
  measurementsPerUnit: 'measurements per unit',
  measurementsUsedByMixedModel: 'measurements a mixed model uses',
  naiveDf: 'degrees of freedom the planned test assumes',
  naiveTypeIError: 'false-positive rate of the planned test',
  observations: 'observations',
  observedMax: 'observed to',
  observedMin: 'observed from',
  occasionCorrelation: 'correlation between occasions',
  occasions: 'occasions',
  perCluster: 'units per cluster',
  periods: 'periods',
  recruitmentForSameN: 'to recruit for the same number analysed',
  replicatesPerUnit: 'replicates per unit',
  residualDf: 'residual degrees of freedom',
  residualVarianceFactor: 'residual variance factor',
  sampleSizeRatio: 'size needed, high ICC over low',
  sequences: 'sequences',
  sharedUnits: 'units sharing it',
  sizeCv: 'CV of cluster sizes',
  slopeSeRatio: 'standard error of the slope, relative',
  splineDf: 'spline degrees of freedom',
  targetMax: 'conclusions to',
  targetMin: 'conclusions from',
  targetRangeCovered: 'share of the conclusion range observed',
  tests: 'tests',
  threshold: 'threshold',
  units: 'units',
  unitsInside: 'units inside each',
  unitsLost: 'units lost',
  unitsPerArm: 'units per arm',
  unstructuredParameters: 'parameters of an unstructured correlation',
  varianceDf: 'degrees of freedom for the variance',
  varianceFactor: 'variance factor',
  varianceFactorHigh: 'variance factor, high',
  varianceFactorLow: 'variance factor, low',
  varianceFactorWithin: 'variance factor within units',
  withinUnitCorrelation: 'correlation within a unit',
};

const AS_PERCENT = new Set(['finalAttrition', 'measurementsUsedByMixedModel', 'targetRangeCovered']);

/** "false-positive rate of the planned test: 37.3%": one of a finding's numbers, in words. */
export function numberText(key: string, value: number): string {
  const label = NUMBER_LABELS[key] ?? key.replace(/([A-Z])/g, ' $1').toLowerCase();
  const percent = (AS_PERCENT.has(key) || /rate|error|power|coverage|share|fraction/i.test(key)) && value <= 1;
  return `${label}: ${percent ? formatPercent(value) : formatNumber(value, 3)}`;
}

/** A finding's sentence cut where it quotes a model between backticks, so the model can be set as code. */
export function proseParts(text: string): { text: string; code: boolean }[] {
  return text
    .split(/`([^`]+)`/)
    .map((part, i) => ({ text: part, code: i % 2 === 1 }))
    .filter((p) => p.text.length > 0);
}
