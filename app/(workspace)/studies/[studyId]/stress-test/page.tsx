import type { Metadata } from 'next';
import Link from 'next/link';
import { Suspense } from 'react';
import { PlanningCaution } from '@/components/calculations/planning-caution';
import { sizeOf } from '@/components/stress-test/sweep';
import { StressTestWorkbench } from '@/components/stress-test/stress-test-workbench';
import { Alert } from '@/components/ui/alert';
import { canStudy } from '@/lib/auth/permissions';
import { currentActor, type Actor } from '@/lib/auth/session';
import { getDesign } from '@/lib/data/designs';
import { MORRIS_2019 } from '@/lib/citations';
import { defaultSimulationSpec, getSimulation, listStudySimulations } from '@/lib/data/simulations';
import { getStudy } from '@/lib/data/studies';
import { AppError } from '@/lib/errors';
import type { SimulationDto } from '@/lib/api/simulations';
import { load } from '@/lib/page-guard';
import { offeredAnalyses } from '@/lib/sim/analyses';
import { describeSimulation, plannedAnalysis, sizeWords } from '@/lib/sim/from-design';
import type { SimulationSpec } from '@/lib/sim/spec';

export const metadata: Metadata = { title: 'Stress test' };

const notFoundAsNull = (e: unknown) => {
  if (e instanceof AppError && e.code === 'not_found') return null;
  throw e;
};

/**
 * The run to show: the one in ?run=…, else the newest of the study's last few runs at the
 * design's own size (runs at other sizes, from "Run at other sizes", are newer but not the
 * study's answer), else the newest.
 */
async function shownRun(actor: Actor | null, requested: string | undefined, runs: SimulationDto[], base: SimulationSpec | null) {
  if (requested) return getSimulation(actor, requested).catch(notFoundAsNull);
  if (runs.length === 0) return null;
  if (base) {
    for (const r of runs.slice(0, 4)) {
      const run = await getSimulation(actor, r.id).catch(notFoundAsNull);
      if (run && sizeOf(run.spec as SimulationSpec) === sizeOf(base)) return run;
    }
  }
  return getSimulation(actor, runs[0]!.id).catch(notFoundAsNull);
}

export default async function StressTestPage({ params, searchParams }: { params: Promise<{ studyId: string }>; searchParams: Promise<{ run?: string | string[] }> }) {
  const { studyId } = await params;
  const { run: runParam } = await searchParams;
  const actor = await currentActor();
  const [study, state, defaults, runs] = await Promise.all([
    load(getStudy(actor, studyId), `/studies/${studyId}/stress-test`),
    load(getDesign(actor, studyId)),
    load(defaultSimulationSpec(actor, studyId)),
    load(listStudySimulations(actor, studyId)),
  ]);
  const shown = await shownRun(actor, typeof runParam === 'string' ? runParam : undefined, runs, defaults.spec);
  const initialRun = shown && shown.studyId === studyId ? (shown as typeof shown & { spec: SimulationSpec }) : null;
  const canRun = canStudy(study.role, 'simulation.run') && study.status !== 'archived';
  const sizeLabel = defaults.spec ? sizeWords(state.design, defaults.spec) : 'units per arm';

  return (
    <div className="space-y-6">
      <div className="grid gap-6 lg:grid-cols-[1fr_24rem]">
        <section aria-labelledby="stress-heading" className="space-y-2">
          <h2 id="stress-heading" className="text-xl font-bold">
            Stress test of revision {defaults.revision}
          </h2>
          <p className="text-sm">
            Simulates data sets from the saved design many times, breaks one assumption at a time, and analyses each data set with several analyses: how
            often each finds the planned effect (power), how often it finds an effect that is not there (false-positive rate, from a paired run at zero
            effect), and whether its 95% confidence intervals hold the true effect 95% of the time. Every figure carries its Monte Carlo SE ({MORRIS_2019.short}).
          </p>
          {defaults.spec &&
            describeSimulation(state.design, defaults.spec).map((s) => (
              <p key={s} className="text-sm" data-testid="simulated-design">
                {s}
              </p>
            ))}
          <p className="text-sm text-muted">
            The defaults come from the{' '}
            <Link href={`/studies/${studyId}/design`} className="text-brand underline">
              design
            </Link>{' '}
            and its{' '}
            <Link href={`/studies/${studyId}/checks`} className="text-brand underline">
              findings
            </Link>
            ; results are saved with the design revision they ran on.
          </p>
        </section>
        <aside>
          <PlanningCaution />
        </aside>
      </div>

      {defaults.unsupported.length > 0 && (
        <Alert tone="caution" title="Not simulated from this design yet">
          {defaults.unsupported.map((m) => (
            <p key={m}>{m}</p>
          ))}
        </Alert>
      )}

      {defaults.missing.length > 0 && (
        <Alert tone="caution" title="Needed before the design can be simulated">
          <ul className="list-disc space-y-1 pl-5">
            {defaults.missing.map((m) => (
              <li key={m}>{m}</li>
            ))}
          </ul>
          <p className="mt-2">
            <Link href={`/studies/${studyId}/design`} className="font-semibold underline">
              Complete it on the Design tab
            </Link>
          </p>
        </Alert>
      )}

      <Suspense fallback={<p className="text-sm text-muted">Loading the stress test…</p>}>
        <StressTestWorkbench
          studyId={studyId}
          revision={defaults.revision}
          base={defaults.spec}
          analyses={defaults.spec ? offeredAnalyses(defaults.spec) : []}
          canRun={canRun}
          initialRun={initialRun}
          runs={runs}
          sizeLabel={sizeLabel}
          planned={defaults.spec ? plannedAnalysis(state.design, defaults.spec) : null}
          targetPower={state.design.assumptions.power}
        />
      </Suspense>
    </div>
  );
}
