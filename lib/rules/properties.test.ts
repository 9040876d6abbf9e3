/**
 * Property tests over random valid designs built from the schema's pieces: runChecks never
 * throws (and no rule fails quietly), every finding is complete and finite, the result is JSON,
 * adopting the recommendation clears every blocker, and no finding says the opposite of the
 * recommendation (see the last test for what "opposite" means).
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  ANALYSIS_METHODS,
  analysisSchema,
  designSchema,
  GROUPING_TYPES,
  LEVEL_KINDS,
  OUTCOME_SHAPES,
  OUTCOME_TYPES,
  type Design,
  type DesignInput,
} from '@/lib/design/schema';
import { RULES, runChecks } from './registry';

const maybe = <T>(arb: fc.Arbitrary<T>) => fc.option(arb, { nil: undefined });
const prob = fc.double({ min: 0, max: 1, noNaN: true });

const levelArb = (i: number) =>
  fc.record({
    id: fc.constant(`l${i}`),
    name: fc.constantFrom('Classroom', 'Pupil', 'Tray', 'Plant', 'Leaf', 'Night', 'Mouse', 'Twin pair', 'GP practice', 'Site', 'Litter', 'Donor', 'Block'),
    kind: fc.constantFrom(...LEVEL_KINDS),
    groupingType: maybe(fc.constantFrom(...GROUPING_TYPES)),
    count: fc.integer({ min: 1, max: 60 }),
    countIsTotal: fc.boolean(),
    countCv: fc.double({ min: 0, max: 3, noNaN: true }),
    sharedEnvironment: fc.boolean(),
    spatialOrSerial: fc.boolean(),
  });

const designArb: fc.Arbitrary<DesignInput> = fc.integer({ min: 0, max: 5 }).chain((nLevels) => {
  const ids = Array.from({ length: nLevels }, (_, i) => `l${i}`);
  const idArb = nLevels > 0 ? maybe(fc.constantFrom(...ids)) : fc.constant(undefined);
  const idList = nLevels > 0 ? fc.subarray(ids) : fc.constant<string[]>([]);
  return fc.record({
    outcome: fc.record({
      name: maybe(fc.constantFrom('Reading score', 'Reaction time', 'Leaf chlorophyll content', 'Infections', 'Ölgehalt 2')),
      type: maybe(fc.constantFrom(...OUTCOME_TYPES)),
      shape: maybe(fc.constantFrom(...OUTCOME_SHAPES)),
      positiveOnly: maybe(fc.boolean()),
      primaryOutcomes: fc.integer({ min: 1, max: 6 }),
      unequalVarianceExpected: maybe(fc.boolean()),
      outliersExpected: maybe(fc.boolean()),
      explanatoryVariables: fc.array(
        fc.record({
          id: fc.constantFrom('dose', 'arm', 'baseline-score', 'age', 'var-1', 'var-2'),
          name: fc.constantFrom('Dose', 'Arm', 'Baseline score', 'Age'),
          role: fc.constantFrom('treatment', 'exposure', 'covariate'),
          kind: fc.constantFrom('categorical', 'continuous'),
          observedMin: maybe(fc.integer({ min: -10, max: 10 })),
          observedMax: maybe(fc.integer({ min: 10, max: 30 })),
          targetMin: maybe(fc.integer({ min: -20, max: 10 })),
          targetMax: maybe(fc.integer({ min: 10, max: 50 })),
        }),
        { maxLength: 3 },
      ),
    }),
    structure: fc.record({
      levels: fc.tuple(...ids.map((_, i) => levelArb(i))),
      crossedFactors: nLevels > 0 ? fc.array(fc.record({ id: fc.constant('rater'), name: fc.constant('Rater'), count: fc.integer({ min: 1, max: 10 }), crossedWithLevelId: fc.constantFrom(...ids) }), { maxLength: 1 }) : fc.constant([]),
    }),
    assignment: fc.record({
      kind: maybe(fc.constantFrom('randomised', 'observed', 'continuous')),
      variableName: maybe(fc.constantFrom('Programme', 'Substrate', 'Sleep-timing schedule')),
      levelId: idArb,
      arms: fc.oneof(fc.constant([]), fc.array(fc.record({ name: fc.constantFrom('A', 'B', 'C', 'D'), allocation: fc.integer({ min: 1, max: 3 }) }), { minLength: 2, maxLength: 4 })),
      blocking: fc.record({ kind: fc.constantFrom('none', 'blocked', 'stratified', 'matched', 'paired'), factor: maybe(fc.constantFrom('School', 'Bench', 'Age group', 'Site', 'Litter', 'Block')), inAnalysis: fc.boolean() }),
      crossover: fc.record({ enabled: fc.boolean(), periods: fc.integer({ min: 2, max: 4 }), washout: maybe(fc.constantFrom('None', 'Two weeks', 'no washout')), carryoverPossible: maybe(fc.boolean()) }),
    }),
    occasions: fc.record({
      timeUnit: fc.constantFrom('weeks', 'days', 'months'),
      list: fc.array(fc.record({ label: fc.constantFrom('Visit', 'Night', 'Week'), time: fc.integer({ min: -5, max: 50 }), baseline: fc.boolean(), attrition: prob }), { maxLength: 10 }),
      trajectoryOfInterest: fc.boolean(),
      correlationStructure: fc.constantFrom('exchangeable', 'ar1', 'unknown'),
    }),
    assumptions: fc.record({
      iccs: fc.subarray(ids).chain((chosen) =>
        fc.tuple(...chosen.map((levelId) => fc.record({ levelId: fc.constant(levelId), value: prob, source: fc.record({ kind: fc.constantFrom('published', 'pilot', 'expert', 'none'), certainty: fc.constantFrom('low', 'medium', 'high') }) }))),
      ),
      occasionCorrelation: maybe(fc.record({ value: fc.double({ min: -1, max: 1, noNaN: true }) })),
      alpha: fc.constantFrom(0.05, 0.01, 0.1),
    }),
    analysis: fc.record({
      method: maybe(fc.constantFrom(...ANALYSIS_METHODS)),
      randomIntercepts: idList,
      fixedEffectLevels: maybe(idList),
      blockEffect: maybe(fc.constantFrom('fixed', 'random')),
      randomSlopeForTime: fc.boolean(),
      unitOfAnalysisLevelId: idArb,
      adjustsForBaseline: fc.boolean(),
      glmFamily: maybe(fc.constantFrom('gaussian', 'binomial', 'poisson', 'negative-binomial', 'gamma', 'beta')),
      standardErrors: fc.constantFrom('model', 'hc3', 'cluster-robust', 'cr2'),
      dfMethod: fc.constantFrom('residual', 'satterthwaite', 'kenward-roger', 'between-within'),
      transformation: fc.constantFrom('none', 'log', 'other'),
      covarianceStructure: fc.constantFrom('not-applicable', 'independence', 'exchangeable', 'ar1', 'unstructured'),
      missingData: fc.constantFrom('not-planned', 'complete-case', 'mixed-model-mar', 'multiple-imputation'),
      multiplicity: fc.constantFrom('none', 'bonferroni', 'holm', 'hierarchical'),
      outlierPlan: maybe(fc.constantFrom('', 'Robust regression as sensitivity analysis.')),
    }),
  }) as fc.Arbitrary<DesignInput>;
});

/** Random designs that pass the schema (a few combinations, such as one arm, do not). */
const validDesign: fc.Arbitrary<Design> = designArb
  .map((d) => designSchema.safeParse(d))
  .filter((r) => r.success)
  .map((r) => r.data!);

const strict = { onRuleError: (id: string, e: unknown) => { throw new Error(`rule ${id} threw: ${e instanceof Error ? e.stack : String(e)}`); } };
const RULE_IDS = new Set(RULES.map((r) => r.id));
const RANK = { blocker: 0, warning: 1, advice: 2 } as const;

describe('runChecks over random valid designs', () => {
  it('never throws, and every finding is complete, cited, finite and sorted', { timeout: 60_000 }, () => {
    fc.assert(
      fc.property(validDesign, (design) => {
        const { findings, recommendation } = runChecks(design, strict);
        for (const f of findings) {
          expect(RULE_IDS.has(f.ruleId)).toBe(true);
          expect(f.key.length).toBeGreaterThan(0);
          expect(f.title.trim()).not.toBe('');
          expect(f.found.trim()).not.toBe('');
          expect(f.why.trim()).not.toBe('');
          expect(f.todo.trim()).not.toBe('');
          expect(f.citations.length).toBeGreaterThanOrEqual(1);
          for (const [k, v] of Object.entries(f.numbers ?? {})) expect(Number.isFinite(v), `${f.ruleId}.${k} = ${v}`).toBe(true);
          expect(`${f.found} ${f.why} ${f.todo}`).not.toMatch(/undefined|NaN|Infinity|\[object/);
        }
        const ranks = findings.map((f) => RANK[f.severity]);
        expect(ranks).toEqual([...ranks].sort((a, b) => a - b));
        const keys = findings.map((f) => `${f.ruleId}:${f.key}`);
        expect(new Set(keys).size).toBe(keys.length);
        expect(recommendation.model).toMatch(/ ~ /);
        expect(recommendation.explanation).not.toMatch(/undefined|NaN/);
      }),
      { numRuns: 400, seed: 20261201 },
    );
  });

  it('the result is JSON and the same on every run', { timeout: 60_000 }, () => {
    fc.assert(
      fc.property(validDesign, (design) => {
        const a = runChecks(design, strict);
        expect(JSON.parse(JSON.stringify(a))).toEqual(a);
        expect(runChecks(structuredClone(design), strict)).toEqual(a);
      }),
      { numRuns: 150, seed: 7 },
    );
  });

  it('adopting the recommendation clears every blocker', { timeout: 60_000 }, () => {
    fc.assert(
      fc.property(validDesign, (design) => {
        const patch = runChecks(design, strict).recommendation.analysisPatch;
        const adopted = designSchema.parse({ ...design, analysis: analysisSchema.parse({ ...design.analysis, ...patch }) });
        const blockers = runChecks(adopted, strict).findings.filter((f) => f.severity === 'blocker');
        expect(blockers.map((b) => `${b.ruleId}:${b.key}`)).toEqual([]);
      }),
      { numRuns: 400, seed: 99 },
    );
  });

  /*
   * "Opposite", concretely: a finding and the recommendation of the same run disagree when
   * (1) a finding quotes a model other than the recommended one;
   * (2) a finding asks for a fixed effect for a level (few-units, level-<id>) while the recommended
   *     model gives it a random intercept, or the recommended model enters a level as a fixed
   *     effect and no finding says why;
   * (3) a finding quotes a design effect for a level the recommendation compares within: a level
   *     above the unit it counts as n, or that unit itself when it receives every arm;
   * (4) a finding warns that an ICC guessed too low leaves the study underpowered for a level the
   *     treatment is compared within, or that one guessed too high does for a level compared between;
   * (5) "blocking not in the analysis" fires although the planned analysis is the recommended one;
   * (6) a per-occasion finding while the recommended model has no treatment × occasion (or × time) term;
   * (7) the cross-over's period finding names the unit's term otherwise than the recommended model
   *     does (a random intercept against a fixed effect, or the reverse);
   * (8) a cross-over (described, or occasions of one unit assigned to the arms) without the
   *     carry-over and period findings.
   */
  it('no finding says the opposite of the recommendation', { timeout: 60_000 }, () => {
    fc.assert(
      fc.property(validDesign, (design) => {
        const { findings, recommendation: rec } = runChecks(design, strict);
        const index = new Map(design.structure.levels.map((l, i) => [l.id, i]));
        const unit = rec.unitOfAnalysis ? index.get(rec.unitOfAnalysis.levelId)! : undefined;
        const withinUnit = /receives every arm/.test(rec.explanation);
        const comparedWithin = (id: string) => unit !== undefined && (index.get(id)! < unit || (index.get(id) === unit && withinUnit));
        for (const f of findings) {
          const where = `${f.ruleId}/${f.key}`;
          if (f.model !== undefined) expect(f.model, where).toBe(rec.model); // (1)
          if (f.ruleId === 'few-units' && f.key.startsWith('level-')) {
            const id = f.key.slice('level-'.length);
            expect(rec.randomIntercepts, where).not.toContain(id); // (2)
            expect(rec.analysisPatch.fixedEffectLevels, where).toContain(id);
          }
          const level = f.levelIds?.[0];
          const quotesDesignEffect = Object.keys(f.numbers ?? {}).some((k) => /^designEffect/.test(k));
          if (level && quotesDesignEffect && f.ruleId !== 'pseudoreplication') expect(comparedWithin(level), `${where} quotes a design effect`).toBe(false); // (3)
          if (level && /guessed too low leaves the study underpowered/.test(f.why)) expect(comparedWithin(level), where).toBe(false); // (4)
          if (level && /guessed too high leaves the study underpowered/.test(f.why)) expect(comparedWithin(level), where).toBe(true);
          if (f.ruleId === 'per-occasion') expect(rec.model, where).toMatch(/ \* (occasion|time|ns\()/); // (6)
          if (f.ruleId === 'crossover' && f.key === 'period' && level) {
            const fixed = (rec.analysisPatch.fixedEffectLevels ?? []).includes(level);
            expect(f.todo, where).toMatch(fixed ? /as a fixed effect:/ : /as a random intercept:/); // (7)
          }
        }
        const A = design.structure.levels.find((l) => l.id === design.assignment.levelId);
        const overTime = A?.kind === 'repeated' && design.structure.levels.slice(0, index.get(A.id)).some((l) => l.kind === 'independent' || l.kind === 'grouping');
        if (design.assignment.crossover.enabled || overTime) {
          for (const key of ['carry-over', 'period']) expect(findings.some((f) => f.ruleId === 'crossover' && f.key === key), `cross-over without ${key}`).toBe(true); // (8)
        }
        for (const id of rec.analysisPatch.fixedEffectLevels ?? []) expect(findings.some((f) => f.ruleId === 'few-units' && f.key === `level-${id}`), `fixed ${id} without a finding`).toBe(true); // (2)
        const adopted = designSchema.parse({ ...design, analysis: analysisSchema.parse({ ...design.analysis, ...rec.analysisPatch }) });
        expect(runChecks(adopted, strict).findings.filter((f) => f.ruleId === 'pairs-and-blocks' && f.key === 'blocking')).toEqual([]); // (5)
      }),
      { numRuns: 400, seed: 1111 },
    );
  });
});
