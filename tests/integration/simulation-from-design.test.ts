/**
 * A stress test from the design, for every demo study (DEMO_STUDIES, so a demo added later is
 * included) and for a design of each shape the wizard accepts: the spec endpoint answers a
 * complete specification that the engine's schema accepts, and a run of 200 replicates per
 * scenario started from the study (its design, not a specification sent) completes through
 * pg-boss with a worker in this process, with every measure of every analysis the design chose.
 */
import { describe, expect, it } from 'vitest';
import { DEMO_STUDIES } from '@/db/demo/studies';
import type { DesignInput } from '@/lib/design/schema';
import { SHAPES } from '@/lib/design/test-shapes';
import { METRIC_NAMES } from '@/lib/sim/metrics';
import { simulationSpecSchema } from '@/lib/sim/spec';
import * as runs from '@/app/api/v1/simulations/route';
import * as studySpec from '@/app/api/v1/studies/[studyId]/simulations/spec/route';
import * as design from '@/app/api/v1/studies/[studyId]/design/route';
import { ctx, makeWorld, request } from '../support/fixtures';
import { useInlineWorker, waitUntilEnded } from '../support/sim-worker';

const REPLICATES = 200;

useInlineWorker();

const DESIGNS: [string, DesignInput][] = [
  ...DEMO_STUDIES.map((s): [string, DesignInput] => [`demo: ${s.title}`, s.design]),
  ['count outcome in clusters', SHAPES['count outcome, clustered']],
  ['binary outcome in clusters', SHAPES['binary outcome, clustered']],
  ['AB/BA cross-over', SHAPES['AB/BA cross-over']],
  ['within-subject comparison over 8 occasions', SHAPES['within-subject comparison over 8 occasions']],
  ['three levels, treatment at the top', SHAPES['three levels, treatment at the top']],
  ['three levels, treatment at the middle', SHAPES['three levels, treatment at the middle']],
];

describe.each(DESIGNS)('from the design: %s', (_name, input) => {
  it(`the spec endpoint answers a complete specification, and ${REPLICATES} replicates run through the queue`, async () => {
    const w = await makeWorld();
    const owner = w.byRole.owner;
    const saved = await design.PUT(request('PUT', `/api/v1/studies/${w.studyId}/design`, { user: owner, body: { baseRevision: 1, design: input } }), ctx({ studyId: w.studyId }));
    expect(saved.status, await saved.clone().text()).toBe(200);

    const res = await studySpec.GET(request('GET', `/api/v1/studies/${w.studyId}/simulations/spec`, { user: w.byRole.viewer }), ctx({ studyId: w.studyId }));
    expect(res.status).toBe(200);
    const derived = await res.json();
    expect(derived, JSON.stringify(derived)).toMatchObject({ revision: 2, missing: [], unsupported: [] });
    const spec = simulationSpecSchema.parse(derived.spec);
    expect(spec).toEqual(derived.spec);
    expect(spec.analyses.length).toBeGreaterThan(0);

    const started = await runs.POST(request('POST', '/api/v1/simulations', { user: owner, body: { studyId: w.studyId, replicates: REPLICATES } }), ctx({}));
    const created = await started.json();
    expect(started.status, JSON.stringify(created)).toBe(202);
    const done = await waitUntilEnded(owner, created.id, 120_000);
    expect(done.status, done.error ?? '').toBe('done');
    expect(done.spec).toMatchObject({ design: spec.design, truth: spec.truth, analyses: spec.analyses, replicates: REPLICATES });
    expect(done.progress.replicatesDone).toBe(REPLICATES * spec.scenarios.length);
    expect(Object.keys(done.results)).toEqual(spec.scenarios.map((s) => s.name ?? s.violation));
    for (const scenario of Object.keys(done.results)) {
      expect(Object.keys(done.results[scenario])).toEqual(spec.analyses);
      for (const analysis of spec.analyses) {
        const m = done.results[scenario][analysis];
        expect(Object.keys(m).sort()).toEqual([...METRIC_NAMES].sort());
        expect(m.power.value, `${scenario} ${analysis}`).toBeGreaterThanOrEqual(0);
        expect(m.typeIError.value, `${scenario} ${analysis}`).toBeLessThanOrEqual(1);
      }
    }
  }, 180_000);
});
