'use client';

import { formatCount, formatDateTime } from '@/lib/format';
import Link from 'next/link';
import type { SimulationDto } from '@/lib/api/simulations';
import { ThreadMarker } from '@/components/review/thread-marker';

const STATUS: Record<SimulationDto['status'], string> = { queued: 'Queued', running: 'Running', done: 'Done', failed: 'Failed', cancelled: 'Cancelled' };

function when(iso: string): string {
  return formatDateTime(iso);
}

/** The study's runs, newest first, each linking to its results (?run=id); the one shown is marked. */
export function PastRuns({ studyId, runs, shownId, hrefFor }: { studyId: string; runs: SimulationDto[]; shownId: string | null; hrefFor: (id: string) => string }) {
  return (
    <section aria-labelledby="past-runs-heading" className="space-y-2 rounded-lg border border-line bg-white p-5">
      <h2 id="past-runs-heading" className="text-lg font-bold">
        Runs of this study
      </h2>
      {runs.length === 0 ? (
        <p className="text-sm text-muted">No stress test has been run on this study yet.</p>
      ) : (
        <div className="overflow-x-auto">
          <table className="w-full text-left text-sm" data-testid="past-runs">
            <caption className="sr-only">Stress tests of this study, newest first</caption>
            <thead>
              <tr className="border-b border-line">
                <th scope="col" className="py-1 pr-3">
                  Started
                </th>
                <th scope="col" className="py-1 pr-3">
                  Design revision
                </th>
                <th scope="col" className="py-1 pr-3">
                  Status
                </th>
                <th scope="col" className="py-1 pr-3 text-right">
                  Replicates
                </th>
                <th scope="col" className="py-1 pr-3">
                  <span className="sr-only">Results</span>
                </th>
                <th scope="col" className="py-1">
                  Comments
                </th>
              </tr>
            </thead>
            <tbody>
              {runs.map((r) => (
                <tr key={r.id} id={`run-${r.id}`} className="border-b border-line/60 align-top">
                  <td className="py-1 pr-3">{when(r.createdAt)}</td>
                  <td className="py-1 pr-3 tabular-nums">{r.revision ?? '—'}</td>
                  <td className="py-1 pr-3">{STATUS[r.status]}</td>
                  <td className="py-1 pr-3 text-right tabular-nums">
                    {formatCount(r.progress.replicatesDone)} of {formatCount(r.progress.replicatesTotal)}
                  </td>
                  <td className="py-1 pr-3">
                    {r.id === shownId ? (
                      <span className="font-semibold">Shown above</span>
                    ) : (
                      <Link href={hrefFor(r.id)} scroll={false} className="text-brand underline">
                        Show<span className="sr-only"> the run started {when(r.createdAt)}</span>
                      </Link>
                    )}
                  </td>
                  <td className="py-1">
                    <ThreadMarker studyId={studyId} anchor={{ kind: 'simulation', simulationId: r.id }} label={`the stress test started ${when(r.createdAt)}`} />
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </section>
  );
}
