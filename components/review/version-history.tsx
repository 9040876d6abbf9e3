'use client';

import { useRouter } from 'next/navigation';
import { useId, useRef, useState, type FormEvent } from 'react';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Button, buttonClass } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { apiFetch, ApiError } from '@/lib/api/client';
import type { VersionDto } from '@/lib/api/versions';
import { formatDateTime, plural } from '@/lib/format';
import { versionAuthors, versionTitle } from './words';

function timeSpan(v: VersionDto): string {
  const from = formatDateTime(v.openedAt);
  if (v.openedAt === v.lastSavedAt) return from;
  const to = formatDateTime(v.lastSavedAt);
  return from.slice(0, 11) === to.slice(0, 11) ? `${from} to ${to.slice(-9)}` : `${from} to ${to}`;
}

function NameForm({ studyId, version, onDone }: { studyId: string; version: VersionDto; onDone: (message: string) => void }) {
  const [name, setName] = useState(version.name ?? '');
  const [error, setError] = useState<string | undefined>();
  const [busy, setBusy] = useState(false);
  async function submit(e: FormEvent) {
    e.preventDefault();
    setBusy(true);
    setError(undefined);
    try {
      await apiFetch(`/api/v1/studies/${studyId}/versions/${version.number}`, { method: 'PATCH', json: { name: name.trim() === '' ? null : name.trim() } });
      onDone(name.trim() ? `Version ${version.number} is now called “${name.trim()}”.` : `Version ${version.number} has no name now.`);
    } catch (err) {
      setError(err instanceof ApiError ? (err.fields?.name?.[0] ?? err.message) : 'The name was not saved.');
    } finally {
      setBusy(false);
    }
  }
  return (
    <form onSubmit={submit} className="mt-2 flex flex-wrap items-end gap-2">
      <div className="min-w-[14rem] flex-1">
        <TextField label={`Name of version ${version.number}`} help="e.g. Sent to the funder, Ethics board v2. Naming the version being edited closes it." value={name} maxLength={120} onChange={(e) => setName(e.target.value)} error={error} />
      </div>
      <Button type="submit" variant="secondary" disabled={busy}>
        Save the name
      </Button>
    </form>
  );
}

/**
 * The history of the design, one row per version (a person's continuous editing; every autosave
 * is kept underneath): who, when, how many saves, its findings, its name and sign-off. Pick two
 * to compare; name one; restore one (a new version with its design, after a confirmation).
 */
export function VersionHistory({ studyId, versions, canName, canRestore }: { studyId: string; versions: VersionDto[]; canName: boolean; canRestore: boolean }) {
  const router = useRouter();
  const [picked, setPicked] = useState<number[]>([]);
  const [naming, setNaming] = useState<number | null>(null);
  const [confirming, setConfirming] = useState<number | null>(null);
  const [message, setMessage] = useState<{ tone: 'success' | 'error'; text: string } | null>(null);
  const headingId = useId();
  const confirmRef = useRef<HTMLButtonElement>(null);

  function toggle(n: number, on: boolean) {
    setPicked((p) => (on ? [...p.filter((x) => x !== n), n].slice(-2) : p.filter((x) => x !== n)));
  }
  const [a, b] = [...picked].sort((x, y) => x - y);

  async function restore(n: number) {
    try {
      const created = await apiFetch<VersionDto>(`/api/v1/studies/${studyId}/versions/${n}/restore`, { method: 'POST' });
      setMessage({ tone: 'success', text: `Version ${n} was restored as version ${created.number}. Nothing was overwritten.` });
      setConfirming(null);
      router.refresh();
    } catch (err) {
      setMessage({ tone: 'error', text: err instanceof ApiError ? err.message : 'The version was not restored.' });
    }
  }

  return (
    <section aria-labelledby={headingId} className="space-y-3 rounded-lg border border-line bg-white p-5">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h2 id={headingId} className="text-lg font-bold">
          History
        </h2>
        <div className="flex items-center gap-2 text-sm">
          <span aria-live="polite">{picked.length === 2 ? `Versions ${a} and ${b} chosen.` : `Choose two versions to compare (${picked.length} of 2).`}</span>
          <Button variant="secondary" disabled={picked.length !== 2} onClick={() => router.push(`/studies/${studyId}/review/compare?from=${a}&to=${b}`)}>
            Compare the two
          </Button>
        </div>
      </div>
      {message && (
        <Alert live tone={message.tone === 'success' ? 'success' : 'error'}>
          {message.text}
        </Alert>
      )}
      {versions.length === 0 ? (
        <p className="text-sm text-muted">Nothing saved yet.</p>
      ) : (
        <ol className="space-y-2">
          {versions.map((v) => (
            <li key={v.number} className="rounded-md border border-line p-3" data-testid="version-row">
              <div className="flex flex-wrap items-start justify-between gap-3">
                <div className="flex items-start gap-3">
                  <input
                    type="checkbox"
                    className="mt-1"
                    id={`pick-${v.number}`}
                    checked={picked.includes(v.number)}
                    onChange={(e) => toggle(v.number, e.target.checked)}
                    aria-label={`Compare ${versionTitle(v)}`}
                  />
                  <div>
                    <p className="font-semibold">
                      {versionTitle(v)} {v.open && <Badge tone="brand">Being edited</Badge>} {v.signedOff && <Badge tone="ok">Signed off</Badge>}
                    </p>
                    <p className="text-sm">{versionAuthors(v)}</p>
                    <p className="text-sm text-muted">
                      {timeSpan(v)} · {plural(v.saves, 'save')}
                      {v.findings !== null ? ` · ${plural(v.findings, 'finding')}` : ''}
                      {v.restoredFrom !== null ? ` · restores version ${v.restoredFrom}` : ''}
                    </p>
                  </div>
                </div>
                <div className="flex flex-wrap gap-1">
                  {canName && !v.signedOff && (
                    <Button variant="ghost" onClick={() => setNaming(naming === v.number ? null : v.number)} aria-expanded={naming === v.number}>
                      {v.name ? 'Rename' : 'Name'}
                      <span className="sr-only"> version {v.number}</span>
                    </Button>
                  )}
                  {canRestore && v.number !== versions[0]!.number && (
                    <Button
                      variant="ghost"
                      onClick={() => {
                        setConfirming(v.number);
                        setTimeout(() => confirmRef.current?.focus(), 0);
                      }}
                    >
                      Restore<span className="sr-only"> version {v.number}</span>
                    </Button>
                  )}
                </div>
              </div>
              {naming === v.number && (
                <NameForm
                  studyId={studyId}
                  version={v}
                  onDone={(text) => {
                    setNaming(null);
                    setMessage({ tone: 'success', text });
                    router.refresh();
                  }}
                />
              )}
              {confirming === v.number && (
                <div role="alertdialog" aria-labelledby={`restore-${v.number}`} className="mt-2 rounded-md border border-caution bg-caution-light p-3 text-sm">
                  <p id={`restore-${v.number}`}>
                    Restore {versionTitle(v)}? Its design becomes the newest version; every version stays in the history.
                  </p>
                  <div className="mt-2 flex gap-2">
                    <button type="button" ref={confirmRef} className={buttonClass()} onClick={() => void restore(v.number)}>
                      Restore version {v.number}
                    </button>
                    <Button variant="secondary" onClick={() => setConfirming(null)}>
                      Keep the current design
                    </Button>
                  </div>
                </div>
              )}
            </li>
          ))}
        </ol>
      )}
    </section>
  );
}
