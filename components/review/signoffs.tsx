'use client';

import Link from 'next/link';
import { useRouter } from 'next/navigation';
import { useId, useState, type FormEvent } from 'react';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { SelectField, TextAreaField, TextField } from '@/components/ui/field';
import { apiFetch, ApiError } from '@/lib/api/client';
import type { SignoffDto, VersionDto } from '@/lib/api/versions';
import { formatDateTime } from '@/lib/format';
import { versionTitle } from './words';

type Fields = Record<string, string[] | undefined>;

function useSubmit() {
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<{ message: string; fields: Fields } | null>(null);
  async function run(fn: () => Promise<unknown>): Promise<boolean> {
    setBusy(true);
    setError(null);
    try {
      await fn();
      return true;
    } catch (err) {
      setError(err instanceof ApiError ? { message: err.message, fields: err.fields ?? {} } : { message: 'That did not go through. Try again.', fields: {} });
      return false;
    } finally {
      setBusy(false);
    }
  }
  return { busy, error, run };
}

/** The consultant's panel: sign off a version (named), with what was reviewed and any conditions. */
export function SignoffPanel({ studyId, versions }: { studyId: string; versions: VersionDto[] }) {
  const router = useRouter();
  const headingId = useId();
  const [version, setVersion] = useState(versions[0]?.number ?? 1);
  const chosen = versions.find((v) => v.number === version);
  const [name, setName] = useState('');
  const [statement, setStatement] = useState('');
  const [conditions, setConditions] = useState('');
  const [done, setDone] = useState<string | null>(null);
  const { busy, error, run } = useSubmit();

  async function submit(e: FormEvent) {
    e.preventDefault();
    setDone(null);
    const ok = await run(() =>
      apiFetch(`/api/v1/studies/${studyId}/signoffs`, {
        method: 'POST',
        json: { version, statement, ...(name.trim() ? { name: name.trim() } : {}), ...(conditions.trim() ? { conditions: conditions.trim() } : {}) },
      }),
    );
    if (ok) {
      setDone(`You signed off version ${version}.`);
      setStatement('');
      setConditions('');
      setName('');
      router.refresh();
    }
  }

  if (versions.length === 0) return null;
  return (
    <section aria-labelledby={headingId} className="space-y-3 rounded-lg border border-line bg-white p-5">
      <h2 id={headingId} className="text-lg font-bold">
        Sign off a version
      </h2>
      <p className="text-sm text-muted">Your sign-off records what you reviewed and on what conditions. The version being edited is closed first, so what you sign off does not change; any later edit shows as a change since your sign-off.</p>
      {done && (
        <Alert live tone="success">
          {done}
        </Alert>
      )}
      {error && !error.fields.name && !error.fields.statement && (
        <Alert live tone="error">
          {error.message}
        </Alert>
      )}
      <form onSubmit={submit} className="space-y-3">
        <SelectField label="Version" value={version} onChange={(e) => setVersion(Number(e.target.value))}>
          {versions.map((v) => (
            <option key={v.number} value={v.number}>
              {versionTitle(v)}
              {v.number === versions[0]!.number ? ' (newest)' : ''}
            </option>
          ))}
        </SelectField>
        {!chosen?.name && (
          <TextField
            label="Name of the version"
            help="A version is signed off by name, e.g. Sent to the funder."
            value={name}
            maxLength={120}
            onChange={(e) => setName(e.target.value)}
            error={error?.fields.name?.[0]}
          />
        )}
        <TextAreaField
          label="What you reviewed"
          help="e.g. The design, the checks and the Plan; the analysis accounts for trays."
          rows={3}
          value={statement}
          maxLength={4000}
          onChange={(e) => setStatement(e.target.value)}
          error={error?.fields.statement?.[0]}
        />
        <TextAreaField label="Conditions (optional)" help="Anything that must hold for this sign-off, e.g. report the ICC used." rows={2} value={conditions} maxLength={2000} onChange={(e) => setConditions(e.target.value)} />
        <Button type="submit" disabled={busy}>
          Sign off version {version}
        </Button>
      </form>
    </section>
  );
}

function WithdrawForm({ studyId, signoff, onDone }: { studyId: string; signoff: SignoffDto; onDone: () => void }) {
  const [reason, setReason] = useState('');
  const { busy, error, run } = useSubmit();
  async function submit(e: FormEvent) {
    e.preventDefault();
    if (await run(() => apiFetch(`/api/v1/studies/${studyId}/signoffs/${signoff.id}/withdraw`, { method: 'POST', json: { reason } }))) onDone();
  }
  return (
    <form onSubmit={submit} className="mt-2 space-y-2">
      <TextAreaField label="Why you withdraw it" rows={2} value={reason} maxLength={2000} onChange={(e) => setReason(e.target.value)} error={error?.fields.reason?.[0] ?? (error && !error.fields.reason ? error.message : undefined)} />
      <Button type="submit" variant="danger" disabled={busy}>
        Withdraw the sign-off
      </Button>
    </form>
  );
}

/** Who signed off what and when, with the statement, conditions and any withdrawal: shown to everyone. */
export function SignoffRecord({ studyId, signoffs, latestVersion, canWithdraw }: { studyId: string; signoffs: SignoffDto[]; latestVersion: number | null; canWithdraw: boolean }) {
  const router = useRouter();
  const headingId = useId();
  const [withdrawing, setWithdrawing] = useState<string | null>(null);
  return (
    <section aria-labelledby={headingId} className="space-y-3 rounded-lg border border-line bg-white p-5">
      <h2 id={headingId} className="text-lg font-bold">
        Sign-offs
      </h2>
      {signoffs.length === 0 ? (
        <p className="text-sm text-muted">No version has been signed off yet. A consultant on the study signs off a named version.</p>
      ) : (
        <ul className="space-y-3">
          {signoffs.map((s) => (
            <li key={s.id} className="rounded-md border border-line p-3 text-sm" data-testid="signoff">
              <p className="font-semibold">
                {versionTitle({ number: s.version, name: s.versionName })} {s.withdrawnAt ? <Badge>Withdrawn</Badge> : <Badge tone="ok">Signed off</Badge>}
              </p>
              <p>
                Signed off by {s.signerName ?? 'someone no longer here'} on {formatDateTime(s.createdAt)}.
              </p>
              <p className="mt-1">
                <span className="font-semibold">Reviewed:</span> {s.statement}
              </p>
              {s.conditions && (
                <p>
                  <span className="font-semibold">Conditions:</span> {s.conditions}
                </p>
              )}
              {s.withdrawnAt && (
                <p className="mt-1 text-danger">
                  Withdrawn by {s.withdrawnByName ?? 'someone no longer here'} on {formatDateTime(s.withdrawnAt)}: {s.withdrawalReason}
                </p>
              )}
              <div className="mt-2 flex flex-wrap gap-3">
                {latestVersion !== null && latestVersion !== s.version && (
                  <Link className="font-semibold text-brand underline" href={`/studies/${studyId}/review/compare?from=${s.version}&to=${latestVersion}`}>
                    What changed since this sign-off
                  </Link>
                )}
                {canWithdraw && !s.withdrawnAt && (
                  <Button variant="ghost" aria-expanded={withdrawing === s.id} onClick={() => setWithdrawing(withdrawing === s.id ? null : s.id)}>
                    Withdraw<span className="sr-only"> the sign-off of version {s.version}</span>
                  </Button>
                )}
              </div>
              {withdrawing === s.id && (
                <WithdrawForm
                  studyId={studyId}
                  signoff={s}
                  onDone={() => {
                    setWithdrawing(null);
                    router.refresh();
                  }}
                />
              )}
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
