/**
 * Every field of a design by a stable path, with the wizard's own words: what a comment is
 * anchored to, what a suggestion changes, and what a comparison of two versions lists.
 *
 * A path names the part, then the field; an item of a list is named by its id where it has one,
 * so that a path keeps pointing at the same thing when items are added, removed or reordered:
 *
 *   outcome.name                          structure.levels[classroom].count
 *   assumptions.iccs[classroom].value     assumptions.effect.source.citation
 *   assignment.arms[0].name               occasions.list[2].attrition
 *
 * (levels, explanatory variables and crossed factors by their id; ICCs by their level's id; arms
 * and occasions, which have no id, by their position.) Values are written in the words and
 * numbers the wizard shows (lib/format.ts for numbers); `describeChanges` lists what differs
 * between two designs in those words. The option words live here, once: the wizard's steps and
 * the Checks tab read them from this module.
 */
import { formatNumber } from '@/lib/format';
import { iccLevels, outcomeAssumptions } from './progress';
import { DESIGN_STEPS, type Analysis, type Assignment, type Design, type DesignPart, type Level, type Outcome } from './schema';

export type DesignField = { path: string; label: string; step: DesignPart };
export type FieldChange = { path: string; label: string; step: DesignPart; before: string; after: string };

// ---------------------------------------------------------------- the wizard's words for choices

export const OUTCOME_TYPE_WORDS: Record<NonNullable<Outcome['type']>, string> = {
  continuous: 'Continuous (a measurement, a score with many values)',
  binary: 'Binary (yes or no)',
  count: 'Count (0, 1, 2, …)',
  proportion: 'Proportion or ratio',
  'bounded-score': 'Bounded score (a scale with a floor and a ceiling)',
  'time-to-event': 'Time to an event',
};

export const OUTCOME_SHAPE_WORDS: Record<NonNullable<Outcome['shape']>, string> = {
  symmetric: 'Roughly symmetric',
  'right-skewed': 'Right-skewed (a long tail of large values)',
  'heavy-tailed': 'Heavy-tailed (more extreme values than a normal curve)',
  'floor-or-ceiling': 'Floor or ceiling (many at the lowest or highest value)',
};

export const VARIABLE_ROLE_WORDS: Record<Outcome['explanatoryVariables'][number]['role'], string> = { treatment: 'Treatment', exposure: 'Exposure', covariate: 'Covariate' };
export const VARIABLE_KIND_WORDS: Record<Outcome['explanatoryVariables'][number]['kind'], string> = { categorical: 'Categorical', continuous: 'Continuous' };

export const LEVEL_KIND_WORDS: Record<Level['kind'], string> = {
  independent: 'Independent units',
  grouping: 'Grouping of units (cluster)',
  repeated: 'Repeated measurements over time',
  replicate: 'Technical replicates or sub-samples',
};

export const ASSIGNMENT_KIND_WORDS: Record<NonNullable<Assignment['kind']>, string> = {
  randomised: 'A randomised treatment',
  observed: 'An observed exposure (not assigned by the team)',
  continuous: 'A continuous explanatory variable',
};

export const BLOCKING_WORDS: Record<Assignment['blocking']['kind'], string> = {
  none: 'None',
  blocked: 'Blocked',
  stratified: 'Stratified',
  matched: 'Matched sets',
  paired: 'Pairs (twins, left and right, before and after)',
};

export const CORRELATION_STRUCTURE_WORDS: Record<Design['occasions']['correlationStructure'], string> = {
  unknown: 'Not known',
  exchangeable: 'Exchangeable (compound symmetry)',
  ar1: 'AR(1): decays with distance in time',
};

export const SOURCE_KIND_WORDS: Record<'none' | 'published' | 'pilot' | 'expert', string> = {
  none: 'No source yet',
  published: 'A published study',
  pilot: 'Pilot data',
  expert: 'Expert judgement',
};

export const CERTAINTY_WORDS: Record<'low' | 'medium' | 'high', string> = { low: 'Not sure', medium: 'Fairly sure', high: 'Sure' };

export const PROPORTION_EFFECT_WORDS: Record<'p2' | 'difference' | 'riskRatio' | 'oddsRatio', string> = {
  p2: 'The proportion expected with the intervention',
  difference: 'A difference in proportions',
  riskRatio: 'A risk ratio',
  oddsRatio: 'An odds ratio',
};

export const METHOD_WORDS: Record<NonNullable<Analysis['method']>, string> = {
  't-test': 't-test comparing the arms',
  'paired-t-test': 'Paired t-test (differences within pairs or units)',
  'per-occasion-tests': 'A separate test or ANOVA at each occasion',
  'linear-regression': 'Linear regression (ordinary least squares)',
  ancova: 'ANCOVA adjusting for baseline',
  'mixed-model': 'Linear mixed model (random effects)',
  gee: 'GEE',
  'cluster-means': 'Analysis of cluster or unit means',
  glm: 'Generalised linear model (GLM)',
  glmm: 'Generalised linear mixed model (GLMM)',
  'robust-regression': 'Robust regression',
  other: 'Other',
};

export const BLOCK_EFFECT_WORDS: Record<NonNullable<Analysis['blockEffect']>, string> = { fixed: 'As a fixed effect', random: 'As a random effect' };

export const GLM_FAMILY_WORDS: Record<NonNullable<Analysis['glmFamily']>, string> = {
  gaussian: 'Gaussian',
  binomial: 'Binomial (logistic)',
  poisson: 'Poisson',
  'negative-binomial': 'Negative binomial',
  gamma: 'Gamma',
  beta: 'Beta',
};

export const STANDARD_ERROR_WORDS: Record<Analysis['standardErrors'], string> = {
  model: 'From the model',
  hc3: 'Robust (HC3)',
  'cluster-robust': 'Cluster-robust',
  cr2: 'Cluster-robust, small-sample (CR2)',
};

export const DF_METHOD_WORDS: Record<Analysis['dfMethod'], string> = {
  residual: 'Residual',
  satterthwaite: 'Satterthwaite',
  'kenward-roger': 'Kenward–Roger',
  'between-within': 'Between–within',
};

export const TRANSFORMATION_WORDS: Record<Analysis['transformation'], string> = { none: 'As measured', log: 'Log scale', other: 'Other transformation' };

export const TIME_MODEL_WORDS: Record<Analysis['timeModel'], string> = {
  'not-applicable': 'Not applicable',
  categorical: 'Each occasion separately',
  linear: 'Linear trend',
  polynomial: 'Polynomial',
  spline: 'Spline',
};

export const COVARIANCE_WORDS: Record<Analysis['covarianceStructure'], string> = {
  'not-applicable': 'Not applicable',
  independence: 'Independence',
  exchangeable: 'Exchangeable',
  ar1: 'AR(1)',
  unstructured: 'Unstructured',
};

export const MISSING_DATA_WORDS: Record<Analysis['missingData'], string> = {
  'not-planned': 'Not planned yet',
  'complete-case': 'Complete cases only',
  'mixed-model-mar': 'All data, mixed model (missing at random)',
  'multiple-imputation': 'Multiple imputation',
};

export const MULTIPLICITY_WORDS: Record<Analysis['multiplicity'], string> = {
  none: 'No adjustment',
  bonferroni: 'Bonferroni',
  holm: 'Holm',
  hierarchical: 'Fixed order (hierarchical testing)',
};

/** The options of a select, in the table's order. */
export function optionsOf<K extends string>(words: Record<K, string>): [K, string][] {
  return Object.entries(words) as [K, string][];
}

// ---------------------------------------------------------------- the fields

/** Where a field sits: the design, and the list item when the field belongs to one. */
type Ctx = { design: Design; item?: Record<string, unknown>; index?: number };

type Format =
  | { kind: 'text' }
  | { kind: 'number'; unit?: (d: Design) => string | undefined }
  | { kind: 'yesno' }
  | { kind: 'choice'; words: Record<string, string> }
  | { kind: 'level' }
  | { kind: 'levels' }
  | { kind: 'texts' };

type Spec = {
  /** The path below the part or the list item. */
  key: string;
  label: string | ((c: Ctx) => string);
  format: Format;
  /** Whether the wizard shows it for this design; a field with a value is listed either way. */
  shown?: (c: Ctx) => boolean;
};

type Collection = {
  /** The list's path, e.g. `structure.levels`. */
  path: string;
  /** How an item is named in a path: by a property of it, or by its position. */
  by: 'id' | 'levelId' | 'index';
  /** The items the wizard shows (by default, those in the design). */
  items?: (d: Design) => Record<string, unknown>[];
  /** An item to create when a field of a missing one is set (ICCs); others cannot be created by a field. */
  create?: (d: Design, selector: string) => Record<string, unknown> | undefined;
  /** The item in words, e.g. `Level “Classroom”`; `selector` when it is not in the design. */
  label: (c: Ctx, selector: string) => string;
  /** An added or removed item is one change (its name), not one per field; ICCs are their fields. */
  summary?: (c: Ctx) => string;
  fields: Spec[];
};

type Entry = { part: DesignPart } & ({ field: Spec } | { list: Collection });

const text: Format = { kind: 'text' };
const num: Format = { kind: 'number' };
const yesno: Format = { kind: 'yesno' };
const choice = (words: Record<string, string>): Format => ({ kind: 'choice', words });
const has = (v: unknown) => v !== undefined && v !== null && !(Array.isArray(v) && v.length === 0);

const levelName = (d: Design, id: unknown) => d.structure.levels.find((l) => l.id === id)?.name;
const unitSuffix = (d: Design) => (d.outcome.unit ? ` (${d.outcome.unit})` : '');

/** The value and its source, as the Assumptions step asks for each number. */
function sourced(key: string, label: (c: Ctx) => string, shown?: (c: Ctx) => boolean, valueFormat: Format = num, extra: Spec[] = []): Spec[] {
  const part = (c: Ctx, what: string) => `${label(c)} — ${what}`;
  return [
    ...extra,
    { key: `${key}.value`, label, format: valueFormat, shown },
    { key: `${key}.source.kind`, label: (c) => part(c, 'Source'), format: choice(SOURCE_KIND_WORDS), shown },
    { key: `${key}.source.citation`, label: (c) => part(c, 'Citation or note'), format: text, shown },
    { key: `${key}.source.certainty`, label: (c) => part(c, 'How sure the team is'), format: choice(CERTAINTY_WORDS), shown },
  ];
}

const asksFor = (name: string) => (c: Ctx) => (outcomeAssumptions(c.design) as string[]).includes(name);
const quoted = (word: string, name: unknown, fallback: string) => `${word} “${typeof name === 'string' && name ? name : fallback}”`;

const ENTRIES: Entry[] = [
  // Outcome
  ...(
    [
      { key: 'name', label: 'Primary outcome', format: text },
      { key: 'unit', label: 'Unit', format: text },
      { key: 'type', label: 'Type of outcome', format: choice(OUTCOME_TYPE_WORDS) },
      { key: 'shape', label: 'Expected shape', format: choice(OUTCOME_SHAPE_WORDS) },
      { key: 'positiveOnly', label: 'Only positive values are possible', format: yesno },
      { key: 'unequalVarianceExpected', label: 'Spread may differ between arms or grow with the mean', format: yesno },
      { key: 'outliersExpected', label: 'Outliers are plausible', format: yesno },
      { key: 'primaryOutcomes', label: 'Number of primary outcomes', format: num },
      { key: 'secondaryOutcomes', label: 'Secondary outcomes', format: { kind: 'texts' }, shown: () => false },
    ] satisfies Spec[]
  ).map((field) => ({ part: 'outcome' as const, field })),
  {
    part: 'outcome',
    list: {
      path: 'outcome.explanatoryVariables',
      by: 'id',
      label: (c, sel) => quoted('Explanatory variable', c.item?.name, sel),
      summary: (c) => `${String(c.item?.name ?? '')} (${VARIABLE_ROLE_WORDS[c.item?.role as 'treatment'] ?? ''})`,
      fields: [
        { key: 'name', label: 'Name', format: text },
        { key: 'role', label: 'Role', format: choice(VARIABLE_ROLE_WORDS) },
        { key: 'kind', label: 'Kind', format: choice(VARIABLE_KIND_WORDS) },
        { key: 'observedMin', label: 'Observed from', format: num },
        { key: 'observedMax', label: 'Observed to', format: num },
        { key: 'targetMin', label: 'Conclusions from', format: num },
        { key: 'targetMax', label: 'Conclusions to', format: num },
      ],
    },
  },
  // Structure
  {
    part: 'structure',
    list: {
      path: 'structure.levels',
      by: 'id',
      label: (c, sel) => quoted('Level', c.item?.name, sel),
      summary: (c) => {
        const l = c.item as Level;
        return `${l.name} (${LEVEL_KIND_WORDS[l.kind]}, ${formatNumber(l.count)})`;
      },
      fields: [
        { key: 'name', label: 'Name', format: text },
        { key: 'kind', label: 'Kind of level', format: choice(LEVEL_KIND_WORDS) },
        {
          key: 'count',
          label: (c) => {
            const i = c.design.structure.levels.findIndex((l) => l.id === c.item?.id);
            return i <= 0 ? 'Number in the study' : `Number per ${c.design.structure.levels[i - 1]!.name}`;
          },
          format: num,
        },
        { key: 'groupingType', label: 'Type of group', format: text, shown: (c) => c.item?.kind === 'grouping' },
        { key: 'countCv', label: 'Variation of that number (CV)', format: num, shown: (c) => c.design.structure.levels.findIndex((l) => l.id === c.item?.id) > 0 },
        { key: 'countIsTotal', label: 'The number is the total in the study, not per unit above', format: yesno, shown: () => false },
        { key: 'sharedEnvironment', label: 'Units share an environment (cage, tank, tray, pot, room)', format: yesno },
        { key: 'spatialOrSerial', label: 'Units are close in space or time (neighbouring plots, consecutive days)', format: yesno },
      ],
    },
  },
  {
    part: 'structure',
    list: {
      path: 'structure.crossedFactors',
      by: 'id',
      label: (c, sel) => quoted('Crossed factor', c.item?.name, sel),
      summary: (c) => String(c.item?.name ?? ''),
      fields: [
        { key: 'name', label: 'Name', format: text },
        { key: 'count', label: 'How many', format: num },
        { key: 'crossedWithLevelId', label: 'Crossed with', format: { kind: 'level' } },
      ],
    },
  },
  // Assignment
  ...(
    [
      { key: 'kind', label: 'What varies', format: choice(ASSIGNMENT_KIND_WORDS) },
      { key: 'variableName', label: 'Name of the treatment or variable', format: text },
      { key: 'levelId', label: 'Level at which it is assigned', format: { kind: 'level' } },
    ] satisfies Spec[]
  ).map((field) => ({ part: 'assignment' as const, field })),
  {
    part: 'assignment',
    list: {
      path: 'assignment.arms',
      by: 'index',
      label: (c, sel) => `Arm ${Number(sel) + 1}${typeof c.item?.name === 'string' && c.item.name ? ` “${c.item.name}”` : ''}`,
      summary: (c) => `${String(c.item?.name ?? '')} (share ${formatNumber(Number(c.item?.allocation))})`,
      fields: [
        { key: 'name', label: 'Name', format: text },
        { key: 'allocation', label: 'Share', format: num },
      ],
    },
  },
  ...(
    [
      { key: 'blocking.kind', label: 'Blocking, stratification or matching', format: choice(BLOCKING_WORDS) },
      { key: 'blocking.factor', label: 'Blocking factor', format: text },
      { key: 'blocking.inAnalysis', label: 'The blocking factor is in the planned analysis', format: yesno },
      { key: 'crossover.enabled', label: 'Cross-over: each unit receives every arm in turn', format: yesno },
      { key: 'crossover.periods', label: 'Periods', format: num, shown: (c) => c.design.assignment.crossover.enabled },
      { key: 'crossover.washout', label: 'Washout between periods', format: text, shown: (c) => c.design.assignment.crossover.enabled },
      { key: 'crossover.carryoverPossible', label: 'An effect may carry over into the next period', format: yesno, shown: (c) => c.design.assignment.crossover.enabled },
    ] satisfies Spec[]
  ).map((field) => ({ part: 'assignment' as const, field })),
  // Occasions
  { part: 'occasions', field: { key: 'timeUnit', label: 'Time unit', format: text } },
  {
    part: 'occasions',
    list: {
      path: 'occasions.list',
      by: 'index',
      label: (c, sel) => `Occasion ${Number(sel) + 1}${typeof c.item?.label === 'string' && c.item.label ? ` “${c.item.label}”` : ''}`,
      summary: (c) => `${String(c.item?.label ?? '')} (time ${formatNumber(Number(c.item?.time))})`,
      fields: [
        { key: 'label', label: 'Label', format: text },
        { key: 'time', label: (c) => `Time (${c.design.occasions.timeUnit || 'units'})`, format: num },
        { key: 'attrition', label: 'Dropped out by then', format: num },
        { key: 'baseline', label: 'Baseline', format: yesno },
      ],
    },
  },
  ...(
    [
      { key: 'trajectoryOfInterest', label: 'The change over time itself is of interest (rates of change, not only the end point)', format: yesno },
      { key: 'correlationStructure', label: 'Expected correlation between occasions', format: choice(CORRELATION_STRUCTURE_WORDS) },
    ] satisfies Spec[]
  ).map((field) => ({ part: 'occasions' as const, field })),
  // Assumptions
  ...[
    ...sourced('controlProportion', () => 'Proportion expected without the intervention', asksFor('controlProportion')),
    ...sourced('proportionEffect', () => 'Effect worth detecting', asksFor('proportionEffect'), num, [
      { key: 'proportionEffect.measure', label: 'State the effect worth detecting as', format: choice(PROPORTION_EFFECT_WORDS), shown: asksFor('proportionEffect') },
    ]),
    ...sourced('baselineRate', () => 'Baseline rate (events per unit of follow-up time)', asksFor('baselineRate')),
    ...sourced('rateRatio', () => 'Rate ratio worth detecting', asksFor('rateRatio')),
    ...sourced('followUpTime', () => 'Follow-up time per unit', asksFor('followUpTime')),
    ...sourced('dispersion', () => 'Overdispersion between units', asksFor('dispersion')),
    ...sourced('betweenClusterCv', () => 'Between-cluster coefficient of variation of the rate', asksFor('betweenClusterCv')),
    ...sourced('outcomeSd', (c) => `Standard deviation of the outcome${unitSuffix(c.design)}`, asksFor('outcomeSd')),
    ...sourced('effect', (c) => `Smallest important difference${unitSuffix(c.design)}`, asksFor('effect')),
  ].map((field) => ({ part: 'assumptions' as const, field })),
  {
    part: 'assumptions',
    list: {
      path: 'assumptions.iccs',
      by: 'levelId',
      items: (d) => [...d.assumptions.iccs, ...iccLevels(d).filter((l) => !d.assumptions.iccs.some((c) => c.levelId === l.id)).map((l) => ({ levelId: l.id }))],
      create: (d, sel) => (d.structure.levels.some((l) => l.id === sel) ? { levelId: sel, source: { kind: 'none', certainty: 'low' } } : undefined),
      label: (c, sel) => `Intracluster correlation (ICC) for ${levelName(c.design, c.item?.levelId ?? sel) ?? sel}`,
      fields: sourced('', (c) => `Intracluster correlation (ICC) for ${levelName(c.design, c.item?.levelId) ?? String(c.item?.levelId)}`).map((s) => ({ ...s, key: s.key.slice(1) })),
    },
  },
  ...[
    ...sourced('occasionCorrelation', () => 'Correlation between occasions', (c) => c.design.occasions.list.length > 1 || c.design.structure.levels.some((l) => l.kind === 'repeated')),
    { key: 'alpha', label: 'Significance level (α)', format: num },
    { key: 'power', label: 'Target power', format: num },
  ].map((field) => ({ part: 'assumptions' as const, field })),
  // Analysis plan
  ...(
    [
      { key: 'method', label: 'Planned analysis', format: choice(METHOD_WORDS) },
      { key: 'unitOfAnalysisLevelId', label: 'Unit counted as n', format: { kind: 'level' } },
      { key: 'randomIntercepts', label: 'Random intercepts for', format: { kind: 'levels' }, shown: (c) => ['mixed-model', 'glmm'].includes(c.design.analysis.method ?? '') },
      { key: 'randomSlopeForTime', label: 'A random slope for time (units change at different rates)', format: yesno, shown: (c) => ['mixed-model', 'glmm'].includes(c.design.analysis.method ?? '') },
      { key: 'fixedEffectLevels', label: 'Levels with few units as fixed effects', format: { kind: 'levels' }, shown: () => false },
      { key: 'blockEffect', label: 'The blocking factor in the model', format: choice(BLOCK_EFFECT_WORDS), shown: (c) => c.design.assignment.blocking.kind !== 'none' },
      { key: 'glmFamily', label: 'Family (for a GLM or GLMM)', format: choice(GLM_FAMILY_WORDS) },
      { key: 'standardErrors', label: 'Standard errors', format: choice(STANDARD_ERROR_WORDS) },
      { key: 'dfMethod', label: 'Degrees of freedom', format: choice(DF_METHOD_WORDS) },
      { key: 'transformation', label: 'Scale of the outcome', format: choice(TRANSFORMATION_WORDS) },
      { key: 'timeModel', label: 'Time in the model', format: choice(TIME_MODEL_WORDS) },
      { key: 'covarianceStructure', label: 'Correlation between occasions in the model', format: choice(COVARIANCE_WORDS) },
      { key: 'missingData', label: 'Missing data', format: choice(MISSING_DATA_WORDS) },
      { key: 'multiplicity', label: 'Several primary outcomes', format: choice(MULTIPLICITY_WORDS) },
      { key: 'adjustsForBaseline', label: 'Adjusts for the baseline measurement', format: yesno },
      { key: 'modelVariance', label: 'Models a different variance per arm', format: yesno },
      { key: 'outlierPlan', label: 'Plan for outliers', format: text },
      { key: 'notes', label: 'Notes', format: text },
    ] satisfies Spec[]
  ).map((field) => ({ part: 'analysis' as const, field })),
];

// ---------------------------------------------------------------- paths

type Segment = { key: string; selector?: string };

const SEGMENT = /^([A-Za-z]+)(?:\[([a-z0-9-]{1,40})\])?$/;

function parse(path: string): Segment[] | null {
  const segments: Segment[] = [];
  for (const s of path.split('.')) {
    const m = SEGMENT.exec(s);
    if (!m) return null;
    segments.push({ key: m[1]!, selector: m[2] });
  }
  return segments;
}

const partPath = (e: Entry) => ('field' in e ? `${e.part}.${e.field.key}` : e.list.path);

/** What a path names: a field of the part, or a field of an item of a list (found or not). */
type Resolved = { entry: Entry; spec: Spec; selector?: string; item?: Record<string, unknown>; index?: number };

function selectorOf(list: Collection, item: Record<string, unknown>, index: number): string {
  return list.by === 'index' ? String(index) : String(item[list.by]);
}

function itemOf(design: Design, list: Collection, selector: string): { item?: Record<string, unknown>; index?: number } {
  const items = get(design, list.path) as Record<string, unknown>[];
  const index = list.by === 'index' ? (/^\d+$/.test(selector) ? Number(selector) : -1) : items.findIndex((x) => x[list.by] === selector);
  return index >= 0 && index < items.length ? { item: items[index], index } : {};
}

function resolve(design: Design, path: string): Resolved | null {
  const segments = parse(path);
  if (!segments) return null;
  const bracket = segments.findIndex((s) => s.selector !== undefined);
  if (bracket < 0) {
    const entry = ENTRIES.find((e) => 'field' in e && partPath(e) === path);
    return entry && 'field' in entry ? { entry, spec: entry.field } : null;
  }
  if (segments.slice(bracket + 1).some((s) => s.selector !== undefined)) return null;
  const listPath = segments.slice(0, bracket + 1).map((s) => s.key).join('.');
  const rest = segments.slice(bracket + 1).map((s) => s.key).join('.');
  const entry = ENTRIES.find((e) => 'list' in e && e.list.path === listPath);
  if (!entry || !('list' in entry)) return null;
  const spec = entry.list.fields.find((f) => f.key === rest);
  if (!spec) return null;
  const selector = segments[bracket]!.selector!;
  return { entry, spec, selector, ...itemOf(design, entry.list, selector) };
}

/** Plain property walk (no selectors). */
function get(root: unknown, dotted: string): unknown {
  return dotted.split('.').reduce<unknown>((o, k) => (o && typeof o === 'object' ? (o as Record<string, unknown>)[k] : undefined), root);
}

const ctxOf = (design: Design, r: Pick<Resolved, 'item' | 'index'>): Ctx => ({ design, item: r.item, index: r.index });

function labelOf(design: Design, r: Resolved): string {
  const own = typeof r.spec.label === 'string' ? r.spec.label : r.spec.label(ctxOf(design, r));
  if (!('list' in r.entry)) return own;
  // ICCs name their level in the field's own label already.
  if (r.entry.list.by === 'levelId') return own;
  return `${r.entry.list.label(ctxOf(design, r), r.selector!)} — ${own}`;
}

// ---------------------------------------------------------------- the public functions

/** Whether `path` names a field of a design (in any design: the item it names may be missing). */
export function isFieldPath(path: string): boolean {
  return resolve(emptyLike, path) !== null;
}
const emptyLike = { structure: { levels: [], crossedFactors: [] }, assumptions: { iccs: [] }, outcome: { explanatoryVariables: [] }, assignment: { arms: [] }, occasions: { list: [] } } as unknown as Design;

/**
 * The fields of `design` in the wizard's order: those its steps show for this design, and any
 * other that holds a value (an SD kept after the outcome became yes-or-no).
 */
export function listFields(design: Design): DesignField[] {
  const out: DesignField[] = [];
  for (const entry of ENTRIES) {
    if ('field' in entry) {
      const path = partPath(entry);
      const c: Ctx = { design };
      if ((entry.field.shown?.(c) ?? true) || has(get(design, path))) out.push({ path, label: labelOf(design, { entry, spec: entry.field }), step: entry.part });
      continue;
    }
    const list = entry.list;
    const items = list.items?.(design) ?? (get(design, list.path) as Record<string, unknown>[]);
    items.forEach((item, index) => {
      const selector = selectorOf(list, item, index);
      const c: Ctx = { design, item, index };
      for (const spec of list.fields) {
        const path = `${list.path}[${selector}].${spec.key}`;
        if ((spec.shown?.(c) ?? true) || has(get(item, spec.key))) out.push({ path, label: labelOf(design, { entry, spec, selector, item, index }), step: entry.part });
      }
    });
  }
  return out;
}

/** The field's label in the wizard's words, with its item ("Level “Classroom” — Number in the study"); the path itself when it names no field. */
export function fieldLabel(design: Design, path: string): string {
  const r = resolve(design, path);
  return r ? labelOf(design, r) : path;
}

/** The wizard step a field belongs to (undefined when the path names no field). */
export function fieldStep(path: string): DesignPart | undefined {
  return resolve(emptyLike, path)?.entry.part;
}

/** The field's value in `design`; undefined when it is not set or its item is not there. */
export function fieldValue(design: Design, path: string): unknown {
  const r = resolve(design, path);
  if (!r) return undefined;
  if (!('list' in r.entry)) return get(design, partPath(r.entry));
  return r.item ? get(r.item, r.spec.key) : undefined;
}

/** A value of the field in the words and numbers the wizard shows ("Yes", "Linear mixed model (random effects)", "12 mmHg"); "not given" when empty. */
export function formatFieldValue(design: Design, path: string, value: unknown): string {
  const r = resolve(design, path);
  return formatAs(design, r?.spec.format ?? text, value);
}

const NOT_GIVEN = 'not given';

function formatAs(design: Design, format: Format, value: unknown): string {
  if (value === undefined || value === null || value === '') return NOT_GIVEN;
  switch (format.kind) {
    case 'number':
      return typeof value === 'number' ? formatNumber(value) : String(value);
    case 'yesno':
      return value ? 'Yes' : 'No';
    case 'choice':
      return format.words[String(value)] ?? String(value);
    case 'level':
      return levelName(design, value) ?? String(value);
    case 'levels':
    case 'texts': {
      const list = Array.isArray(value) ? value : [value];
      if (list.length === 0) return 'none';
      return list.map((v) => (format.kind === 'levels' ? (levelName(design, v) ?? String(v)) : String(v))).join(', ');
    }
    default:
      return String(value);
  }
}

/**
 * A copy of `design` with the field set to `value` (undefined removes it). An ICC that is not
 * there yet is created for a level of the structure; a field of any other missing item throws.
 * The caller validates the result with designSchema.
 */
export function withFieldValue(design: Design, path: string, value: unknown): Design {
  const r = resolve(design, path);
  if (!r) throw new Error(`Not a field of a design: ${path}`);
  const copy = structuredClone(design);
  let target: Record<string, unknown>;
  let key: string;
  if (!('list' in r.entry)) {
    key = partPath(r.entry);
    target = copy as unknown as Record<string, unknown>;
  } else {
    const list = r.entry.list;
    const items = get(copy, list.path) as Record<string, unknown>[];
    let item = r.index !== undefined ? items[r.index] : undefined;
    if (!item) {
      const created = list.create?.(copy, r.selector!);
      if (!created) throw new Error(`The design has no item for ${path}`);
      items.push(created);
      item = created;
    }
    target = item;
    key = r.spec.key;
  }
  const keys = key.split('.');
  for (const k of keys.slice(0, -1)) {
    if (!target[k] || typeof target[k] !== 'object') target[k] = {};
    target = target[k] as Record<string, unknown>;
  }
  const last = keys[keys.length - 1]!;
  if (value === undefined) delete target[last];
  else target[last] = value;
  return copy;
}

const same = (x: unknown, y: unknown) => JSON.stringify(x ?? null) === JSON.stringify(y ?? null);

/**
 * What differs from design `a` to design `b`, in the wizard's order and words: one change per
 * field (before → after), one per item of a list added or removed (a level, an arm), and the order
 * of the levels when only their order changed. Labels are those of `b` (of `a` for what `b` lost).
 */
export function describeChanges(a: Design, b: Design): FieldChange[] {
  const changes: FieldChange[] = [];
  const fieldsA = listFields(a);
  const fieldsB = listFields(b);
  const pathsB = new Set(fieldsB.map((f) => f.path));
  const itemsDone = new Set<string>();
  // In b's order, then what only a has, each in its step's place.
  const order = DESIGN_STEPS.map((s) => s.part);
  const all = [...fieldsB, ...fieldsA.filter((f) => !pathsB.has(f.path))].sort((x, y) => order.indexOf(x.step) - order.indexOf(y.step));
  const seen = new Set<string>();
  for (const f of all) {
    if (seen.has(f.path)) continue;
    seen.add(f.path);
    const ra = resolve(a, f.path)!;
    const rb = resolve(b, f.path)!;
    if ('list' in rb.entry && rb.entry.list.summary && Boolean(ra.item) !== Boolean(rb.item)) {
      const list = rb.entry.list;
      const itemPath = `${list.path}[${rb.selector}]`;
      if (itemsDone.has(itemPath)) continue;
      itemsDone.add(itemPath);
      const [design, r] = rb.item ? [b, rb] : [a, ra];
      const summary = list.summary!(ctxOf(design, r));
      changes.push({ path: itemPath, label: list.label(ctxOf(design, r), r.selector!), step: f.step, before: ra.item ? summary : 'none', after: rb.item ? summary : 'none' });
      continue;
    }
    const va = fieldValue(a, f.path);
    const vb = fieldValue(b, f.path);
    if (same(va, vb)) continue;
    const before = formatFieldValue(a, f.path, va);
    const after = formatFieldValue(b, f.path, vb);
    if (before === after) continue;
    changes.push({ path: f.path, label: rb.item || !('list' in rb.entry) ? labelOf(b, rb) : labelOf(a, ra), step: f.step, before, after });
  }
  const idsA = a.structure.levels.map((l) => l.id);
  const idsB = b.structure.levels.map((l) => l.id);
  if (!same(idsA, idsB) && same([...idsA].sort(), [...idsB].sort())) {
    const names = (d: Design) => d.structure.levels.map((l) => l.name).join(' → ');
    const at = changes.findIndex((c) => c.step !== 'outcome');
    changes.splice(at < 0 ? changes.length : at, 0, { path: 'structure.levels', label: 'Order of the levels', step: 'structure', before: names(a), after: names(b) });
  }
  return changes;
}
