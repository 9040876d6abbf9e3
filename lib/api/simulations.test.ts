import { describe, expect, it } from 'vitest';
import type { Simulation } from '@/db/repositories/simulations';
import { progressOf, simulationDto } from './simulations';

const base: Simulation = {
  id: '00000000-0000-4000-8000-000000000001',
  studyId: null,
  revisionNumber: null,
  createdBy: null,
  spec: { scenarios: [{ violation: 'skewed' }, { violation: 'none', name: 'baseline' }], analyses: ['mixed', 'ols'] },
  status: 'running',
  replicatesTotal: 1000,
  replicatesDone: 250,
  chunkSize: 50,
  chunkCount: 20,
  jobIds: [],
  firstTurn: 0,
  error: null,
  results: null,
  startedAt: new Date('2026-12-02T10:00:00Z'),
  finishedAt: null,
  createdAt: new Date('2026-12-02T09:59:00Z'),
};

describe('progressOf', () => {
  it.each([
    // 250 replicates in 10 s: 25 per second, 750 left → 30 s.
    { run: base, now: '2026-12-02T10:00:10Z', rate: 25, eta: 30 },
    { run: { ...base, replicatesDone: 0 }, now: '2026-12-02T10:00:10Z', rate: null, eta: null },
    { run: { ...base, status: 'queued' as const, replicatesDone: 0, startedAt: null }, now: '2026-12-02T10:00:10Z', rate: null, eta: null },
    // Ended runs: the rate over their whole run, nothing left to wait for.
    { run: { ...base, status: 'done' as const, replicatesDone: 1000, finishedAt: new Date('2026-12-02T10:00:20Z') }, now: '2026-12-02T11:00:00Z', rate: 50, eta: 0 },
    { run: { ...base, status: 'cancelled' as const, finishedAt: new Date('2026-12-02T10:00:05Z') }, now: '2026-12-02T11:00:00Z', rate: 50, eta: 0 },
  ])('$run.status with $run.replicatesDone done → rate $rate, eta $eta', ({ run, now, rate, eta }) => {
    const p = progressOf(run, new Date(now));
    expect(p).toEqual({ replicatesDone: run.replicatesDone, replicatesTotal: 1000, replicatesPerSecond: rate, etaSeconds: eta });
  });
});

describe('simulationDto', () => {
  const metric = (v: number) => ({ value: v, mcse: 0.01 });
  const done: Simulation = {
    ...base,
    status: 'done',
    replicatesDone: 1000,
    finishedAt: new Date('2026-12-02T10:01:00Z'),
    // As jsonb gives it back: keys in its own order.
    results: {
      results: {
        baseline: { ols: { power: metric(0.8), bias: metric(0) }, mixed: { typeIError: metric(0.05), power: metric(0.7) } },
        skewed: { ols: { power: metric(0.9) }, mixed: { power: metric(0.6) } },
      },
      summary: ['When the assumptions hold (baseline), analysed with ols, …'],
    },
  };

  it('orders results as the specification asked: scenarios, analyses, then the metrics', () => {
    const dto = simulationDto(done);
    expect(Object.keys(dto.results!)).toEqual(['skewed', 'baseline']);
    expect(Object.keys(dto.results!.baseline!)).toEqual(['mixed', 'ols']);
    expect(Object.keys(dto.results!.baseline!.ols!)).toEqual(['power', 'bias']);
    expect(Object.keys(dto.results!.baseline!.mixed!)).toEqual(['power', 'typeIError']);
    expect(dto.summary).toEqual(done.results && (done.results as { summary: string[] }).summary);
  });

  it('leaves out results unless done, and the specification unless asked', () => {
    expect(simulationDto(base)).not.toHaveProperty('results');
    expect(simulationDto(done, { withResults: false })).not.toHaveProperty('results');
    expect(simulationDto(base)).not.toHaveProperty('spec');
    expect(simulationDto(base, { withSpec: true }).spec).toBe(base.spec);
  });
});
