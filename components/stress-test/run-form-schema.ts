/**
 * The Stress test tab's form: which scenarios (each with its parameters), which analyses, how
 * many replicates and which seed. The form's values become a compact specification
 * (`toSpec`) that the server checks again with `simulationSpecSchema`. The parameters' bounds and
 * defaults are the engine's (`SCENARIO_RANGES`, `REPLICATES`, `SEED` in lib/sim/spec.ts), in the
 * form's words; only replicates are narrowed, to 100 … 20,000 per scenario, so that a run from
 * the tab stays interactive.
 */
import { z } from 'zod';
import { ANALYSIS_NAMES } from '@/lib/models/types';
import { scenarioApplies } from '@/lib/sim/analyses';
import { formatBound, REPLICATES, SCENARIO_RANGES, SEED, SLOPE_SD, type Range, type Scenario, type SimulationSpec, type SimulationSpecInput, type Violation } from '@/lib/sim/spec';
import { VIOLATIONS } from './words';
import { formatCount } from '@/lib/format';

/** The tab's replicates: within the engine's range, narrowed so that a run stays interactive. */
export const MIN_REPLICATES = Math.max(REPLICATES.min, 100);
export const MAX_TAB_REPLICATES = Math.min(REPLICATES.max, 20_000);

/**
 * A parameter's field: the engine's `range`, shown `times` larger (a fraction as a percentage),
 * with messages naming `subject` ("The SD ratio") and the `unit` after each bound.
 */
export function rangeField(range: Range & { why?: string }, subject: string, { times = 1, unit = '' } = {}) {
  const bound = (x: number) => `${formatBound(x * times)}${unit}`;
  const n = z.number({ error: `Enter ${subject.toLowerCase()} as a number.` }).finite(`Enter ${subject.toLowerCase()} as a number.`);
  const why = range.why ? `, ${range.why}` : '';
  const low = range.minOpen ? n.gt(range.min * times, `${subject} must be above ${bound(range.min)}${why}.`) : n.min(range.min * times, `${subject} is at least ${bound(range.min)}.`);
  return low.max(range.max * times, `${subject} can be at most ${bound(range.max)}.`);
}

const R = SCENARIO_RANGES;

export const runFormSchema = z.object({
  scenarios: z
    .object({
      none: z.object({ on: z.boolean() }),
      skewed: z.object({ on: z.boolean(), sigmaLog: rangeField(R.skewed.sigmaLog, 'The σ of the log') }),
      'heavy-tailed': z.object({ on: z.boolean(), df: rangeField(R['heavy-tailed'].df, 'The degrees of freedom') }),
      outliers: z.object({
        on: z.boolean(),
        percent: rangeField(R.outliers.fraction, 'The share of outliers', { times: 100, unit: '%' }),
        scale: rangeField(R.outliers.scale, 'The multiplier'),
      }),
      'unequal-variance': z.object({ on: z.boolean(), sdRatio: rangeField(R['unequal-variance'].sdRatio, 'The SD ratio') }),
      nonlinear: z.object({ on: z.boolean(), strength: rangeField(R.nonlinear.strength, 'The rise of the curve', { unit: ' SD' }) }),
      serial: z.object({ on: z.boolean(), ar: rangeField(R.serial.ar, 'The AR(1) correlation ρ') }),
      'carry-over': z.object({ on: z.boolean(), percent: rangeField(R['carry-over'].fraction, 'The share of the effect carried over', { times: 100, unit: '%' }) }),
    })
    .refine((s) => VIOLATIONS.some((v) => s[v].on), { message: 'Choose at least one scenario.', path: ['none', 'on'] }),
  analyses: z.array(z.enum(ANALYSIS_NAMES), { error: 'Choose at least one analysis.' }).min(1, 'Choose at least one analysis.'),
  replicates: z
    .number({ error: 'Enter the number of replicates.' })
    .int('Replicates must be a whole number.')
    .min(MIN_REPLICATES, `At least ${MIN_REPLICATES} replicates.`)
    .max(MAX_TAB_REPLICATES, `At most ${formatCount(MAX_TAB_REPLICATES)} replicates from this tab.`),
  /** SD of the units' random slopes over time (designs whose effect is a difference in slopes); 0 = parallel trends within an arm. */
  slopeSd: rangeField(SLOPE_SD, 'The SD of the slopes'),
  seed: z.number({ error: 'Enter the seed as a whole number.' }).int('The seed is a whole number.').min(SEED.min, `The seed is at least ${SEED.min}.`).max(SEED.max, 'The seed is too large.'),
});

export type RunFormValues = z.infer<typeof runFormSchema>;

/** The form's starting values: the scenarios, analyses, replicates and seed of `spec`, other parameters at their defaults. */
export function formDefaults(spec: SimulationSpec): RunFormValues {
  const has = (v: string) => spec.scenarios.find((s) => s.violation === v);
  const skewed = has('skewed');
  const heavy = has('heavy-tailed');
  const outliers = has('outliers');
  const unequal = has('unequal-variance');
  const nonlinear = has('nonlinear');
  const serial = has('serial');
  const carry = has('carry-over');
  return {
    scenarios: {
      none: { on: Boolean(has('none')) },
      skewed: { on: Boolean(skewed), sigmaLog: skewed?.violation === 'skewed' ? skewed.sigmaLog : R.skewed.sigmaLog.default },
      'heavy-tailed': { on: Boolean(heavy), df: heavy?.violation === 'heavy-tailed' ? heavy.df : R['heavy-tailed'].df.default },
      outliers: {
        on: Boolean(outliers),
        percent: (outliers?.violation === 'outliers' ? outliers.fraction : R.outliers.fraction.default) * 100,
        scale: outliers?.violation === 'outliers' ? outliers.scale : R.outliers.scale.default,
      },
      'unequal-variance': { on: Boolean(unequal), sdRatio: unequal?.violation === 'unequal-variance' ? unequal.sdRatio : R['unequal-variance'].sdRatio.default },
      nonlinear: { on: Boolean(nonlinear), strength: nonlinear?.violation === 'nonlinear' ? nonlinear.strength : R.nonlinear.strength.default },
      serial: { on: Boolean(serial), ar: serial?.violation === 'serial' ? serial.ar : R.serial.ar.default },
      'carry-over': { on: Boolean(carry), percent: (carry?.violation === 'carry-over' ? carry.fraction : R['carry-over'].fraction.default) * 100 },
    },
    analyses: [...spec.analyses],
    replicates: Math.min(MAX_TAB_REPLICATES, Math.max(MIN_REPLICATES, spec.replicates)),
    slopeSd: spec.truth.randomSlopeSd,
    seed: spec.seed,
  };
}

/** One scenario as the engine reads it, from the form's values for violation `v` (a curve in time when there are occasions, else in a covariate). */
export function scenarioFromForm(v: Violation, s: RunFormValues['scenarios'], hasOccasions: boolean): Scenario {
  switch (v) {
    case 'none':
      return { violation: 'none' };
    case 'skewed':
      return { violation: 'skewed', sigmaLog: s.skewed.sigmaLog };
    case 'heavy-tailed':
      return { violation: 'heavy-tailed', df: s['heavy-tailed'].df };
    case 'outliers':
      return { violation: 'outliers', fraction: s.outliers.percent / 100, scale: s.outliers.scale };
    case 'unequal-variance':
      return { violation: 'unequal-variance', model: 'arm', sdRatio: s['unequal-variance'].sdRatio };
    case 'nonlinear':
      return { violation: 'nonlinear', shape: 'quadratic', on: hasOccasions ? 'time' : 'covariate', strength: s.nonlinear.strength };
    case 'serial':
      return { violation: 'serial', ar: s.serial.ar };
    case 'carry-over':
      return { violation: 'carry-over', fraction: s['carry-over'].percent / 100 };
  }
}

/** The scenarios the form offers for `base`: those that apply to its data (lib/sim/analyses.ts). */
export function offeredViolations(base: SimulationSpec): Violation[] {
  return VIOLATIONS.filter((v) => scenarioApplies(v, base));
}

/** The specification for a run: the design's `base` with the form's scenarios, analyses, replicates and seed. */
export function toSpec(base: SimulationSpec, v: RunFormValues): SimulationSpecInput {
  return {
    design: base.design,
    truth: base.design.target === 'treat:time' ? { ...base.truth, randomSlopeSd: v.slopeSd } : base.truth,
    alpha: base.alpha,
    scenarios: offeredViolations(base).filter((x) => v.scenarios[x].on).map((x) => scenarioFromForm(x, v.scenarios, base.design.occasions !== undefined)),
    analyses: ANALYSIS_NAMES.filter((a) => v.analyses.includes(a)),
    replicates: v.replicates,
    seed: v.seed,
  };
}
