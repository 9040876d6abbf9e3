'use client';

import { useState } from 'react';
import type { SimulationDto } from '@/lib/api/simulations';
import { Button } from '@/components/ui/button';
import { formatCount } from '@/lib/format';

const STATUS_WORDS: Record<SimulationDto['status'], string> = {
  queued: 'Waiting for a worker',
  running: 'Running',
  done: 'Finished',
  failed: 'Failed',
  cancelled: 'Cancelled',
};

/** "1,200 of 5,000 replicates · about 20 s left" */
export function progressText(p: SimulationDto['progress']): string {
  const count = `${formatCount(p.replicatesDone)} of ${formatCount(p.replicatesTotal)} replicates`;
  if (p.etaSeconds === null || p.replicatesDone >= p.replicatesTotal) return count;
  const eta = p.etaSeconds < 90 ? `${Math.max(1, Math.round(p.etaSeconds))} s` : `${Math.round(p.etaSeconds / 60)} min`;
  return `${count} · about ${eta} left`;
}

/** A run's progress bar with its status, and Cancel (confirmed first) while it is queued or running. */
export function RunProgress({ run, canCancel, cancelling, onCancel }: { run: SimulationDto; canCancel: boolean; cancelling: boolean; onCancel: () => void }) {
  const { replicatesDone, replicatesTotal } = run.progress;
  const active = run.status === 'queued' || run.status === 'running';
  const share = replicatesTotal > 0 ? Math.min(1, replicatesDone / replicatesTotal) : 0;
  const text = progressText(run.progress);
  const [confirming, setConfirming] = useState(false);
  return (
    <div className="space-y-2">
      <div className="flex flex-wrap items-baseline justify-between gap-2 text-sm">
        <p>
          <span className="font-semibold">{STATUS_WORDS[run.status]}</span>
          {run.status === 'failed' && run.error ? `: ${run.error}` : ''}
        </p>
        <p className="tabular-nums" data-testid="progress-text">
          {text}
        </p>
      </div>
      <div
        role="progressbar"
        aria-label="Replicates done"
        aria-valuemin={0}
        aria-valuemax={replicatesTotal}
        aria-valuenow={replicatesDone}
        aria-valuetext={text}
        className="h-3 w-full overflow-hidden rounded-full border border-line bg-brand-light"
      >
        <div className="h-full bg-brand transition-[width] duration-500" style={{ width: `${(share * 100).toFixed(1)}%` }} />
      </div>
      {active && canCancel && !confirming && (
        <Button variant="danger" onClick={() => setConfirming(true)} disabled={cancelling}>
          {cancelling ? 'Cancelling…' : 'Cancel this run'}
        </Button>
      )}
      {active && canCancel && confirming && (
        <div role="group" aria-labelledby={`confirm-${run.id}`} className="space-y-2 rounded-md border-l-4 border-danger bg-danger-light px-4 py-3 text-sm">
          <p id={`confirm-${run.id}`} className="font-semibold text-danger">
            Stop this run? The replicates done so far are discarded; the last finished run stays in view.
          </p>
          <div className="flex flex-wrap gap-2">
            <Button
              variant="danger"
              onClick={() => {
                setConfirming(false);
                onCancel();
              }}
            >
              Yes, stop the run
            </Button>
            <Button variant="secondary" onClick={() => setConfirming(false)}>
              Keep it running
            </Button>
          </div>
        </div>
      )}
    </div>
  );
}
