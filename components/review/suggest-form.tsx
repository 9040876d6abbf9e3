'use client';

import { useState } from 'react';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { SelectField, TextAreaField, TextField } from '@/components/ui/field';
import { apiFetch, ApiError } from '@/lib/api/client';
import type { SuggestionDto } from '@/lib/api/review';
import type { SuggestableField } from '@/lib/review/suggestable';
import { useRefreshReview } from './use-review';


/** Proposes a new value for one field with a reason; the server checks the value fits the design. */
export function SuggestForm({ studyId, fields, initialPath }: { studyId: string; fields: SuggestableField[]; initialPath?: string }) {
  const refresh = useRefreshReview(studyId);
  const [path, setPath] = useState(initialPath && fields.some((f) => f.path === initialPath) ? initialPath : (fields[0]?.path ?? ''));
  const [value, setValue] = useState('');
  const [reason, setReason] = useState('');
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [message, setMessage] = useState<{ tone: 'error' | 'success'; text: string } | null>(null);
  const [busy, setBusy] = useState(false);
  const field = fields.find((f) => f.path === path);
  if (!field) return <p className="text-sm text-muted">The design has no fields to suggest a change to yet.</p>;

  function parsed(): string | number | boolean | null {
    if (value.trim() === '') return null;
    if (field!.kind === 'number') return Number(value);
    if (field!.kind === 'yesno') return value === 'yes';
    return value.trim();
  }

  async function submit() {
    setBusy(true);
    setMessage(null);
    setErrors({});
    try {
      await apiFetch<SuggestionDto>(`/api/v1/studies/${studyId}/suggestions`, { method: 'POST', json: { path, value: parsed(), reason } });
      setMessage({ tone: 'success', text: 'Suggestion sent to the owner and editors.' });
      setValue('');
      setReason('');
      await refresh();
    } catch (e) {
      if (e instanceof ApiError) {
        setErrors(Object.fromEntries(Object.entries(e.fields ?? {}).map(([k, v]) => [k, v[0] ?? ''])));
        setMessage({ tone: 'error', text: e.message });
      } else setMessage({ tone: 'error', text: 'The suggestion was not saved. Try again.' });
    } finally {
      setBusy(false);
    }
  }

  return (
    <form
      className="space-y-3"
      onSubmit={(e) => {
        e.preventDefault();
        void submit();
      }}
    >
      <SelectField
        label="Field"
        value={path}
        error={errors.path}
        onChange={(e) => {
          setPath(e.target.value);
          setValue('');
        }}
      >
        {fields.map((f) => (
          <option key={f.path} value={f.path}>
            {f.stepLabel}: {f.label}
          </option>
        ))}
      </SelectField>
      <p className="text-sm">
        <span className="font-semibold">Now: </span>
        {field.currentText}
      </p>
      {field.kind === 'yesno' ? (
        <SelectField label="Suggested value" value={value} error={errors.value} onChange={(e) => setValue(e.target.value)} required>
          <option value="">Choose…</option>
          <option value="yes">Yes</option>
          <option value="no">No</option>
        </SelectField>
      ) : (
        <TextField
          label="Suggested value"
          inputMode={field.kind === 'number' ? 'decimal' : undefined}
          value={value}
          error={errors.value}
          onChange={(e) => setValue(e.target.value)}
          help={field.kind === 'number' ? 'A number, with a point for decimals.' : 'Leave empty to suggest clearing the field.'}
        />
      )}
      <TextAreaField label="Reason" rows={2} value={reason} error={errors.reason} onChange={(e) => setReason(e.target.value)} required />
      {message && (
        <Alert tone={message.tone} live>
          {message.text}
        </Alert>
      )}
      <Button type="submit" disabled={busy}>
        {busy ? 'Sending…' : 'Suggest this change'}
      </Button>
    </form>
  );
}
