import { describe, expect, it } from 'vitest';
import { classroom, simple, variant } from '@/lib/rules/__fixtures__/designs';
import { clusterRandomised, outcomeAssumptions, stepStates } from './progress';

/** The Assumptions step asks for the numbers of the outcome's own family, and is complete with them. */
describe('the outcome numbers the Assumptions step asks for', () => {
  it.each([
    ['continuous', simple, ['outcomeSd', 'effect']],
    ['binary', variant(simple, (d) => void (d.outcome.type = 'binary')), ['controlProportion', 'proportionEffect']],
    ['count, randomised one by one', variant(simple, (d) => void (d.outcome.type = 'count')), ['baselineRate', 'rateRatio', 'followUpTime', 'dispersion']],
    ['count, whole classrooms randomised', variant(classroom, (d) => void (d.outcome.type = 'count')), ['baselineRate', 'rateRatio', 'followUpTime', 'dispersion', 'betweenClusterCv']],
  ])('%s', (_label, design, names) => {
    expect(outcomeAssumptions(design)).toEqual(names);
  });

  it('a binary outcome is complete with its proportion and effect, without an SD', () => {
    const d = variant(simple, (x) => {
      x.outcome.type = 'binary';
      delete x.assumptions.outcomeSd;
      delete x.assumptions.effect;
      x.assumptions.controlProportion = { value: 0.3, source: { kind: 'pilot', certainty: 'medium' } };
    });
    expect(stepStates(d).assumptions).toBe('started');
    const done = variant(d, (x) => void (x.assumptions.proportionEffect = { measure: 'oddsRatio', value: 1.8, source: { kind: 'expert', certainty: 'low' } }));
    expect(stepStates(done).assumptions).toBe('complete');
  });

  it('whole clusters randomised: classrooms yes, pupils one by one no', () => {
    expect(clusterRandomised(classroom)).toBe(true);
    expect(clusterRandomised(simple)).toBe(false);
  });
});
