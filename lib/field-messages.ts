/**
 * Leaf: the one place where a refused input becomes words. Installs zod's error map for the whole
 * app (`z.config({ customError })`): every issue that a schema does not word itself becomes a plain
 * sentence that names the field by its label and says what to enter ("Enter the cost per unit as a
 * number above 0."), never zod's own wording ("Too big: expected number to be <0.5") nor an input's
 * API name (costPerUnit). The forms (zodResolver), the server actions and the API's field messages
 * all read the same sentences, because every schema starts from lib/text-schema.ts, which imports
 * this module and so installs the map wherever a schema exists (server, worker, browser).
 */
import { z } from 'zod';
import { formatNumber } from './format';

/**
 * Inputs whose label is not their name split into words ("costPerUnit" → "cost per unit" needs no
 * entry): abbreviations, symbols and names that mean something else in running text.
 */
const LABELS: Record<string, string> = {
  alpha: 'significance level (alpha)',
  power: 'power',
  icc: 'intracluster correlation (ICC)',
  iccs: 'intracluster correlations',
  blockIcc: 'intracluster correlation of the blocks',
  iccScale: 'scale of the ICC',
  sd: 'standard deviation',
  sdX: 'standard deviation of the predictor',
  residualSd: 'residual standard deviation',
  outcomeSd: 'standard deviation of the outcome',
  sdRatio: 'ratio of the standard deviations',
  sigmaLog: 'standard deviation of the log',
  delta: 'difference in means',
  f2: 'effect size f²',
  nPerGroup: 'sample size per group',
  n: 'sample size',
  p1: 'proportion in the comparison group',
  p2: 'proportion with the intervention',
  rho: 'correlation between occasions',
  ar: 'correlation between neighbouring occasions',
  cv: 'variation in cluster size (CV)',
  clusterCv: 'variation in cluster size (CV)',
  clusterSizeCv: 'variation in cluster size (CV)',
  countCv: 'variation in the counts (CV)',
  betweenClusterCv: 'between-cluster variation of the rate (CV)',
  df: 'degrees of freedom',
  dfMethod: 'method for the degrees of freedom',
  glmFamily: 'kind of outcome',
  family: 'kind of outcome',
  ratio: 'allocation between the arms',
  solveFor: 'quantity to solve for',
  kind: 'kind of calculation',
  multiplicity: 'adjustment for several outcomes',
  sides: 'test (one- or two-sided)',
  dropout: 'expected attrition',
  clusterDropout: 'share of clusters expected to drop out',
  outcomes: 'number of primary outcomes',
  id: 'identifier',
  levelId: 'level',
  unitOfAnalysisLevelId: 'level of the unit of analysis',
  crossedWithLevelId: 'crossed level',
  studyId: 'study',
  workspaceId: 'workspace',
  userId: 'member',
  ruleId: 'check',
  baseRevision: 'revision the edit started from',
  schemaVersion: 'version of the design',
  callbackUrl: 'page to return to',
  token: 'link',
  confirm: 'password again',
  email: 'email address',
  pageSize: 'number of rows per page',
  q: 'search text',
  seed: 'random seed',
  replicates: 'number of replicates',
  unitsPerArm: 'units per arm',
  targetMin: 'lowest plausible value',
  targetMax: 'highest plausible value',
  observedMin: 'lowest value seen',
  observedMax: 'highest value seen',
  periodEffects: 'period effects',
  occasionCorrelation: 'correlation between occasions',
  marginal: 'population-average effect',
  testedPredictors: 'number of predictors tested',
  predictors: 'number of predictors in the model',
  totalObservations: 'total units',
  washout: 'washout',
  on: 'variable the curve is in',
  dir: 'sort direction',
  sort: 'column to sort by',
};

/** The words for an input's name: its label, or the name split into lower-case words. */
export function fieldLabel(name: string): string {
  const label = LABELS[name];
  if (label) return label;
  return name
    .replace(/([a-z0-9])([A-Z])/g, '$1 $2')
    .replace(/[_-]+/g, ' ')
    .toLowerCase()
    .trim();
}

/** A label that starts a sentence: "The search" stays, an input's name becomes "The cost per unit". */
export function sentenceLabel(label: string): string {
  if (/\s/.test(label) || /^[A-Z]/.test(label)) return label;
  const words = fieldLabel(label);
  return `The ${words}`;
}

/** The field an issue is about: the last named step of its path ("levels.0.name" → "name"). */
function fieldOf(path: readonly PropertyKey[] | undefined): string | undefined {
  const named = (path ?? []).filter((p): p is string => typeof p === 'string');
  return named[named.length - 1];
}

const bound = (x: unknown) => (typeof x === 'number' ? formatNumber(x, 6) : typeof x === 'bigint' ? x.toString() : String(x));

type Issue = z.core.$ZodRawIssue;

/** A plain sentence for a zod issue: what is wrong, in terms of what to enter. */
export function fieldMessage(issue: Issue): string {
  const name = fieldOf(issue.path);
  const label = name ? fieldLabel(name) : 'value';
  const the = `the ${label}`;
  switch (issue.code) {
    case 'invalid_type': {
      if (issue.input === undefined || issue.input === null || issue.input === '') return `Enter ${the}.`;
      switch (issue.expected) {
        case 'int':
          return `Enter ${the} as a whole number.`;
        case 'number':
        case 'bigint':
          return `Enter ${the} as a number.`;
        case 'string':
          return `Enter ${the} as text.`;
        case 'boolean':
          return `Choose yes or no for ${the}.`;
        case 'array':
          return `Give ${the} as a list.`;
        case 'date':
          return `Enter ${the} as a date.`;
        default:
          return `Fill in ${the}.`;
      }
    }
    case 'too_small': {
      const min = bound(issue.minimum);
      if (issue.origin === 'string') return Number(issue.minimum) <= 1 ? `Enter ${the}.` : `Enter at least ${min} characters for ${the}.`;
      if (issue.origin === 'array' || issue.origin === 'set') return `Give at least ${min} ${Number(issue.minimum) === 1 ? 'entry' : 'entries'} for ${the}.`;
      return issue.inclusive === false ? `Enter ${the} as a number above ${min}.` : `Enter ${the} as a number of at least ${min}.`;
    }
    case 'too_big': {
      const max = bound(issue.maximum);
      if (issue.origin === 'string') return `Shorten ${the} to at most ${max} characters.`;
      if (issue.origin === 'array' || issue.origin === 'set') return `Give at most ${max} entries for ${the}.`;
      return issue.inclusive === false ? `Enter ${the} as a number below ${max}.` : `Enter ${the} as a number of at most ${max}.`;
    }
    case 'not_multiple_of':
      return `Enter ${the} in steps of ${bound(issue.divisor)}.`;
    case 'invalid_value':
    case 'invalid_union':
      return `Choose ${the} from the options offered.`;
    case 'invalid_format':
      if (issue.format === 'email') return 'Enter an email address such as name@example.org.';
      if (issue.format === 'url') return `Enter ${the} as a web address starting with https://.`;
      if (issue.format === 'uuid' || issue.format === 'guid') return `Choose ${the} from the list.`;
      return `Enter ${the} in the form asked for.`;
    case 'unrecognized_keys':
      return `Leave out what this form does not ask for (${issue.keys.length === 1 ? 'one entry' : `${issue.keys.length} entries`}).`;
    case 'invalid_key':
    case 'invalid_element':
      return `Check the entries of ${the}.`;
    default:
      return `Check ${the}.`;
  }
}

z.config({ customError: (issue) => fieldMessage(issue) });
