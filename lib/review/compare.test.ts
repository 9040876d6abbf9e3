import { describe, expect, it } from 'vitest';
import { classroom, variant } from '@/lib/rules/__fixtures__/designs';
import { runChecks } from '@/lib/rules/registry';
import { simulationSpecSchema } from '@/lib/sim/spec';
import type { SimulationResults } from '@/lib/sim/run';
import plans from '@/lib/plan/fixtures/demo_plans.json';
import { compareVersions, planFigures, type VersionSnapshot } from './compare';

const spec = simulationSpecSchema.parse({
  design: { arms: 2, clustersPerArm: 4, clusterSize: 5 },
  truth: { effect: 0.8, sd: 1, icc: 0.1 },
  scenarios: [{ violation: 'none' }, { violation: 'skewed' }],
  analyses: ['ols', 'cluster-means'],
  replicates: 1000,
  seed: 1,
});

const rate = (value: number) => ({ value, mcse: Math.sqrt((value * (1 - value)) / 1000) });
/** Results where ols has the false-positive rate `olsRate` in every scenario and cluster means keeps 5%. */
function results(olsRate: number): SimulationResults {
  const cell = (fp: number) => ({ typeIError: rate(fp), coverage: rate(1 - fp), power: rate(0.9) });
  return Object.fromEntries(['none', 'skewed'].map((v) => [v, { ols: cell(olsRate), 'cluster-means': cell(0.05) }])) as unknown as SimulationResults;
}

function snapshot(number: number, design = classroom, run: VersionSnapshot['run'] = null): VersionSnapshot {
  const checks = runChecks(design);
  return { number, name: null, design, findings: checks.findings, recommendation: checks.recommendation, run };
}

describe('comparing two versions', () => {
  it('the Plan’s size and power of the classroom demo, as R gives them (lib/plan/fixtures/demo_plans.json, R 4.2.2 stats::pt)', () => {
    const ref = plans.plans.classroom;
    const f = planFigures(classroom, runChecks(classroom).recommendation);
    expect(f).toMatchObject({ kind: 'cluster-means', sizeLabel: expect.any(String), requiredSize: ref.value, plannedSize: ref.planned, targetPower: 0.8, missing: [] });
    expect(f.powerAtPlanned).toBeCloseTo(ref.plannedPower, 6);
  });

  it('says what is missing when the design has no effect or SD yet, without figures', () => {
    const bare = variant(classroom, (d) => {
      delete d.assumptions.outcomeSd;
      delete d.assumptions.effect;
    });
    const f = planFigures(bare);
    expect(f.requiredSize).toBeNull();
    expect(f.powerAtPlanned).toBeNull();
    expect(f.missing.length).toBeGreaterThan(0);
  });

  it('findings that appeared and cleared, by rule and key', () => {
    const fixed = variant(classroom, (d) => {
      d.analysis.method = 'mixed-model';
      d.analysis.randomIntercepts = ['classroom'];
      d.analysis.unitOfAnalysisLevelId = 'classroom';
    });
    const c = compareVersions(snapshot(1), snapshot(2, fixed));
    expect(c.findings.cleared.map((f) => f.ruleId)).toContain('unit-of-analysis');
    const back = compareVersions(snapshot(2, fixed), snapshot(3));
    expect(back.findings.appeared.map((f) => f.ruleId)).toContain('unit-of-analysis');
    expect(back.findings.cleared).toEqual(c.findings.appeared);
  });

  it('stress-test verdicts before and after, only when both versions have a run', () => {
    const before = { id: '00000000-0000-4000-8000-000000000001', spec, results: results(0.25) };
    const after = { id: '00000000-0000-4000-8000-000000000002', spec, results: results(0.05) };
    expect(compareVersions(snapshot(1, classroom, before), snapshot(2)).stress).toBeNull();
    const c = compareVersions(snapshot(1, classroom, before), snapshot(2, classroom, after));
    expect(c.stress!.rows.map((r) => [r.scenario.violation, r.analysis, r.before, r.after])).toEqual([
      ['none', 'ols', 'broken', 'holds'],
      ['none', 'cluster-means', 'holds', 'holds'],
      ['skewed', 'ols', 'broken', 'holds'],
      ['skewed', 'cluster-means', 'holds', 'holds'],
    ]);
  });
});
