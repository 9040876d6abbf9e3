/**
 * The Stress test tab's form: which scenarios (each with its parameters), which analyses, how
 * many replicates and which seed. The form's values become a compact specification
 * (`toSpec`) that the server checks again with `simulationSpecSchema`; bounds here match it, with
 * replicates kept to 100 … 20,000 per scenario so that a run from the tab stays interactive.
 */
import { z } from 'zod';
import { ANALYSIS_NAMES } from '@/lib/models/types';
import { scenarioApplies } from '@/lib/sim/analyses';
import type { Scenario, SimulationSpec, SimulationSpecInput, Violation } from '@/lib/validation/simulations';
import { VIOLATIONS } from './words';

export const MIN_REPLICATES = 100;
export const MAX_TAB_REPLICATES = 20_000;

const n = (label: string) => z.number({ error: `Enter ${label} as a number.` }).finite(`Enter ${label} as a number.`);

export const runFormSchema = z.object({
  scenarios: z
    .object({
      none: z.object({ on: z.boolean() }),
      skewed: z.object({ on: z.boolean(), sigmaLog: n('the σ of the log').gt(0, 'The σ of the log must be above 0.').max(2, 'The σ of the log can be at most 2.') }),
      'heavy-tailed': z.object({ on: z.boolean(), df: n('the degrees of freedom').gt(2, 'Degrees of freedom must be above 2, so that the SD is finite.').max(1000, 'At most 1,000 df.') }),
      outliers: z.object({
        on: z.boolean(),
        percent: n('the share of outliers').gt(0, 'The share must be above 0%.').max(50, 'The share can be at most 50%.'),
        scale: n('the multiplier').gt(1, 'The multiplier must be above 1.').max(100, 'The multiplier can be at most 100.'),
      }),
      'unequal-variance': z.object({ on: z.boolean(), sdRatio: n('the SD ratio').min(0.05, 'The SD ratio is at least 0.05.').max(20, 'The SD ratio can be at most 20.') }),
      nonlinear: z.object({ on: z.boolean(), strength: n('the rise of the curve').min(-10, 'The rise is at least −10 SD.').max(10, 'The rise can be at most 10 SD.') }),
      serial: z.object({ on: z.boolean(), ar: n('the AR(1) correlation').min(-0.99, 'ρ is at least −0.99.').max(0.99, 'ρ can be at most 0.99.') }),
      'carry-over': z.object({ on: z.boolean(), percent: n('the share of the effect carried over').min(-1000, 'The share is at least −1,000%.').max(1000, 'The share can be at most 1,000%.') }),
    })
    .refine((s) => VIOLATIONS.some((v) => s[v].on), { message: 'Choose at least one scenario.', path: ['none', 'on'] }),
  analyses: z.array(z.enum(ANALYSIS_NAMES), { error: 'Choose at least one analysis.' }).min(1, 'Choose at least one analysis.'),
  replicates: z
    .number({ error: 'Enter the number of replicates.' })
    .int('Replicates must be a whole number.')
    .min(MIN_REPLICATES, `At least ${MIN_REPLICATES} replicates.`)
    .max(MAX_TAB_REPLICATES, `At most ${MAX_TAB_REPLICATES.toLocaleString('en-GB')} replicates from this tab.`),
  /** SD of the units' random slopes over time (designs whose effect is a difference in slopes); 0 = parallel trends within an arm. */
  slopeSd: n('the SD of the slopes').min(0, 'The SD of the slopes is at least 0.').max(1e6, 'The SD of the slopes can be at most 1,000,000.'),
  seed: z.number({ error: 'Enter the seed as a whole number.' }).int('The seed is a whole number.').min(0, 'The seed is at least 0.').max(Number.MAX_SAFE_INTEGER, 'The seed is too large.'),
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
      skewed: { on: Boolean(skewed), sigmaLog: skewed?.violation === 'skewed' ? skewed.sigmaLog : 0.8 },
      'heavy-tailed': { on: Boolean(heavy), df: heavy?.violation === 'heavy-tailed' ? heavy.df : 3 },
      outliers: {
        on: Boolean(outliers),
        percent: outliers?.violation === 'outliers' ? outliers.fraction * 100 : 5,
        scale: outliers?.violation === 'outliers' ? outliers.scale : 5,
      },
      'unequal-variance': { on: Boolean(unequal), sdRatio: unequal?.violation === 'unequal-variance' ? unequal.sdRatio : 2 },
      nonlinear: { on: Boolean(nonlinear), strength: nonlinear?.violation === 'nonlinear' ? nonlinear.strength : 1 },
      serial: { on: Boolean(serial), ar: serial?.violation === 'serial' ? serial.ar : 0.5 },
      'carry-over': { on: Boolean(carry), percent: carry?.violation === 'carry-over' ? carry.fraction * 100 : 50 },
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
