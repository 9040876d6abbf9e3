'use client';

import { formatDateTime } from '@/lib/format';
import { useQuery } from '@tanstack/react-query';
import { formatValue, labelOf } from '@/components/calculations/format';
import { kindInfo } from '@/components/calculations/kinds';
import { apiFetch } from '@/lib/api/client';
import type { PlanResultDto } from '@/lib/api/dto';
import { ThreadMarker } from '@/components/review/thread-marker';
import type { CalculationOutput } from '@/lib/stats/calculations/types';

export const savedResultsKey = (studyId: string) => ['plan-results', studyId] as const;

/** "Clusters per arm 35, power 80.4%", from the saved output. */
export function headline(output: CalculationOutput): string {
  const key = output.solvedFor;
  if (!key) return output.method;
  const main = `${labelOf(key)} ${formatValue(key, output.result[key])}`;
  return key === 'power' || output.result.power === undefined ? main : `${main}, power ${formatValue('power', output.result.power)}`;
}


/** Results saved to the study, newest first: revision, who, when and the headline. */
export function SavedResults({ studyId, initial, currentRevision }: { studyId: string; initial: PlanResultDto[]; currentRevision: number }) {
  const q = useQuery({
    queryKey: savedResultsKey(studyId),
    queryFn: () => apiFetch<{ items: PlanResultDto[] }>(`/api/v1/studies/${studyId}/plans`),
    initialData: { items: initial },
  });
  const items = q.data.items;
  return (
    <section aria-labelledby="saved-heading" className="space-y-3 rounded-lg border border-line bg-white p-5">
      <h3 id="saved-heading" className="text-base font-bold">
        Saved results
      </h3>
      {items.length === 0 ? (
        <p className="text-sm text-muted">Nothing saved yet. A saved result keeps the inputs, the answer and the design revision it was computed from.</p>
      ) : (
        <table className="w-full text-left text-sm" data-testid="saved-results">
          <caption className="sr-only">Saved results, newest first</caption>
          <thead>
            <tr className="border-b border-line">
              <th scope="col" className="py-1 pr-3">
                Revision
              </th>
              <th scope="col" className="py-1 pr-3">
                Calculation
              </th>
              <th scope="col" className="py-1 pr-3">
                Answer
              </th>
              <th scope="col" className="py-1 pr-3">
                Saved by
              </th>
              <th scope="col" className="py-1 pr-3">
                When (UTC)
              </th>
              <th scope="col" className="py-1">
                Comments
              </th>
            </tr>
          </thead>
          <tbody>
            {items.map((r) => (
              <tr key={r.id} id={`plan-result-${r.id}`} className="border-b border-line/60 align-top">
                <td className="py-1 pr-3 tabular-nums">
                  {r.revision}
                  {r.revision !== currentRevision && <span className="block text-xs text-muted">older design</span>}
                </td>
                <td className="py-1 pr-3">{kindInfo(r.kind)?.title ?? r.kind}</td>
                <td className="py-1 pr-3">
                  {headline(r.output)}
                  {r.note && <span className="block text-xs text-muted">{r.note}</span>}
                </td>
                <td className="py-1 pr-3">{r.createdByName ?? 'A former member'}</td>
                <td className="py-1 pr-3 tabular-nums">{formatDateTime(r.createdAt)}</td>
                <td className="py-1">
                  <ThreadMarker studyId={studyId} anchor={{ kind: 'plan', planResultId: r.id }} label={`the result saved ${formatDateTime(r.createdAt)}`} />
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </section>
  );
}
