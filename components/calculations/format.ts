/**
 * How calculation values are shown: powers and error rates as percentages with one decimal,
 * sizes as whole numbers, other numbers to four significant digits. Nothing shows NaN: a value
 * that is missing or not finite reads "—".
 */
import { formatNumber, formatPercent } from '@/lib/format';
import type { ResultValue } from '@/lib/stats/calculations/types';

/** Probabilities shown as percentages: power and false-positive rates. */
const PERCENT = /power|typeierror|falsepositive/i;
/** Shares entered as fractions, shown as percentages too. */
const SHARES = new Set(['dropout', 'clusterDropout']);

export function isPercentKey(key: string): boolean {
  return PERCENT.test(key) || SHARES.has(key);
}

export { formatNumber, formatPercent };

/** Test settings kept as codes in a request, in the words the form offers them with. */
const SETTING_WORDS: Record<string, Record<string, string>> = {
  sides: { '1': 'one-sided', '2': 'two-sided' },
  multiplicity: { none: 'none', bonferroni: 'Bonferroni', holm: 'Holm' },
};

export function formatValue(key: string, value: ResultValue | undefined): string {
  if (value === null || value === undefined) return '—';
  const setting = SETTING_WORDS[key]?.[String(value)];
  if (setting) return setting;
  if (typeof value === 'boolean') return value ? 'yes' : 'no';
  if (typeof value === 'string') return value;
  if (Array.isArray(value)) return value.map((v) => formatNumber(v)).join(', ');
  if (isPercentKey(key)) return formatPercent(value);
  if (key === 'ratio' && value > 0) return `${formatNumber(value)} (shares ${formatPercent(1 / (1 + value))} and ${formatPercent(value / (1 + value))})`;
  return formatNumber(value);
}

/** Labels of the names the API uses, for the inputs and derived values the result lists. */
export const VALUE_LABELS: Record<string, string> = {
  delta: 'Difference in means',
  sd: 'Standard deviation',
  alpha: 'Significance level (alpha)',
  power: 'Power',
  nPerGroup: 'Sample size per group',
  ratio: 'Units in the second group for each one in the first',
  sides: 'Sides of the test',
  dropout: 'Expected attrition',
  outcomes: 'Primary outcomes',
  multiplicity: 'Adjustment for several outcomes',
  f2: 'Effect size f²',
  slope: 'Slope',
  sdX: 'Standard deviation of the predictor',
  residualSd: 'Residual standard deviation',
  testedPredictors: 'Predictors tested',
  predictors: 'Predictors in the model',
  n: 'Sample size',
  icc: 'Intracluster correlation (ICC)',
  clusterSize: 'Units per cluster',
  cv: 'Variation in cluster size (CV)',
  clustersPerArm: 'Clusters per arm',
  clusterDropout: 'Clusters expected to drop out',
  rho: 'Correlation between occasions',
  baselines: 'Baseline measurements',
  followUps: 'Follow-up measurements',
  analysis: 'Analysis',
  slopeDifference: 'Difference in slopes',
  times: 'Times of measurement',
  p1: 'Proportion in the comparison group',
  p2: 'Proportion with the intervention',
  riskRatio: 'Risk ratio',
  oddsRatio: 'Odds ratio',
  direction: 'Direction of the effect',
  baselineRate: 'Baseline rate (events per unit of follow-up time)',
  rateRatio: 'Rate ratio',
  treatedRate: 'Rate with the intervention',
  rateDifference: 'Difference in rates',
  exposure: 'Follow-up time per participant',
  dispersion: 'Overdispersion (negative binomial dispersion)',
  betweenClusterCv: 'Between-cluster coefficient of variation of the rate',
  personTimePerCluster: 'Follow-up time per cluster (person-time)',
  expectedEventsPerCluster: 'Events expected per cluster without the intervention',
  expectedEvents: 'Events expected in group 1',
  expectedEventsGroup2: 'Events expected in group 2',
  clustersPerArmByT: 'Clusters per arm by the t distribution',
  continuityCorrection: 'Continuity correction',
  totalObservations: 'Total units',
  costPerCluster: 'Cost per cluster',
  costPerUnit: 'Cost per unit',
  budget: 'Budget',
  designEffect: 'Design effect',
  effectiveSampleSize: 'Effective sample size',
  naiveTypeIError: 'False-positive rate if clustering is ignored',
  targetPower: 'Target power',
  standardizedEffect: 'Standardised effect (delta / sd)',
  nGroup2: 'Sample size in group 2',
  alphaAdjusted: 'Alpha per outcome',
  degreesOfFreedom: 'Degrees of freedom',
  noncentrality: 'Noncentrality',
  nPerGroupToRecruit: 'To recruit per group',
  nGroup2ToRecruit: 'To recruit in group 2',
  nToRecruit: 'To recruit',
  clusterSizeToRecruit: 'Units to recruit per cluster',
  clustersPerArmToRecruit: 'Clusters to recruit per arm',
  totalAnalysed: 'Total analysed',
  totalToRecruit: 'Total to recruit',
  clusterSizeInteger: 'Best whole cluster size',
  costPerFullCluster: 'Cost of one full cluster',
  costPerInformation: 'Cost per unit of information',
  budgetUsed: 'Budget used',
  budgetNeeded: 'Budget needed',
  difference: 'Difference in proportions',
  powerT: 'Power by the t distribution',
  powerNormal: 'Power by the normal approximation',
  nPerGroupNormal: 'Sample size per group by the normal approximation',
  deltaNormal: 'Difference by the normal approximation',
  slopeDifferenceNormal: 'Difference in rates of change by the normal approximation',
  varianceFactor: 'Variance factor',
  standardError: 'Standard error',
  effectiveNPerGroup: 'Effective sample size per group',
  sumOfSquaredTimeDeviations: 'Sum of squared time deviations',
  plateauPower: 'Highest power with very large clusters',
  clustersPerArmNeeded: 'Clusters per arm needed',
};

/** A label for any result name: the table above, else the camelCase name in words. */
export function labelOf(key: string): string {
  if (VALUE_LABELS[key]) return VALUE_LABELS[key]!;
  const words = key.replace(/([a-z0-9])([A-Z])/g, '$1 $2').toLowerCase();
  return words.charAt(0).toUpperCase() + words.slice(1);
}
