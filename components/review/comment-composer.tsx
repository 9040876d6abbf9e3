'use client';

import { useId, useMemo, useRef, useState, type KeyboardEvent } from 'react';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { TextAreaField } from '@/components/ui/field';
import { ApiError } from '@/lib/api/client';
import { mentionToken } from '@/lib/review/mentions';
import { useMembers } from './use-review';

interface Person {
  id: string;
  name: string;
}

/** The "@partial name" right before the caret, if the person is typing a mention. */
function mentionQuery(text: string, caret: number): { start: number; query: string } | null {
  const before = text.slice(0, caret);
  const m = /(^|\s)@([^\s@<>]{0,30}(?: [^\s@<>]{0,30})?)$/.exec(before);
  return m ? { start: caret - m[2]!.length - 1, query: m[2]!.toLowerCase() } : null;
}

/**
 * A comment box with @mentions of the study's members: typing @ opens a list of members that
 * match what follows (arrow keys to move, Enter or Tab to pick, Escape to close). Picked members
 * show as "@Name" while typing and are sent as `<@id>`, so only members can be mentioned.
 */
export function CommentComposer({
  studyId,
  label,
  submitLabel,
  onSubmit,
  onCancel,
  autoFocus = false,
}: {
  studyId: string;
  label: string;
  submitLabel: string;
  onSubmit: (body: string) => Promise<unknown>;
  onCancel?: () => void;
  autoFocus?: boolean;
}) {
  const members = useMembers(studyId);
  const [text, setText] = useState('');
  const [picked, setPicked] = useState<Person[]>([]);
  const [caret, setCaret] = useState(0);
  const [active, setActive] = useState(0);
  const [closed, setClosed] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const ref = useRef<HTMLTextAreaElement>(null);
  const listId = useId();

  const people: Person[] = useMemo(() => (members.data?.items ?? []).map((m) => ({ id: m.userId, name: m.name ?? m.email })), [members.data]);
  const q = closed ? null : mentionQuery(text, caret);
  const matches = q ? people.filter((p) => p.name.toLowerCase().includes(q.query)).slice(0, 6) : [];
  const open = matches.length > 0;

  function pick(p: Person) {
    if (!q) return;
    const next = `${text.slice(0, q.start)}@${p.name} ${text.slice(caret)}`;
    const at = q.start + p.name.length + 2;
    setText(next);
    setPicked((list) => (list.some((x) => x.id === p.id) ? list : [...list, p]));
    setActive(0);
    requestAnimationFrame(() => {
      ref.current?.focus();
      ref.current?.setSelectionRange(at, at);
      setCaret(at);
    });
  }

  function onKeyDown(e: KeyboardEvent<HTMLTextAreaElement>) {
    if (!open) return;
    if (e.key === 'ArrowDown' || e.key === 'ArrowUp') {
      e.preventDefault();
      setActive((i) => (i + (e.key === 'ArrowDown' ? 1 : matches.length - 1)) % matches.length);
    } else if (e.key === 'Enter' || e.key === 'Tab') {
      e.preventDefault();
      pick(matches[Math.min(active, matches.length - 1)]!);
    } else if (e.key === 'Escape') {
      e.preventDefault();
      setClosed(true);
    }
  }

  /** "@Name" of each picked member becomes their token; longer names first, so "@Ann Lee" is not read as "@Ann". */
  function body(): string {
    let out = text;
    for (const p of [...picked].sort((a, b) => b.name.length - a.name.length)) out = out.split(`@${p.name}`).join(mentionToken(p.id));
    return out.trim();
  }

  async function submit() {
    if (!text.trim()) {
      setError('Write a comment first.');
      return;
    }
    setBusy(true);
    setError(null);
    try {
      await onSubmit(body());
      setText('');
      setPicked([]);
    } catch (e) {
      setError(e instanceof ApiError ? e.message : 'The comment was not saved. Try again.');
    } finally {
      setBusy(false);
    }
  }

  return (
    <form
      className="space-y-2"
      onSubmit={(e) => {
        e.preventDefault();
        void submit();
      }}
    >
      <div className="relative">
        <TextAreaField
          ref={ref}
          label={label}
          help="Type @ to mention a member of this study; they are told by e-mail."
          rows={3}
          value={text}
          autoFocus={autoFocus}
          maxLength={5000}
          aria-controls={open ? listId : undefined}
          aria-activedescendant={open ? `${listId}-${Math.min(active, matches.length - 1)}` : undefined}
          onChange={(e) => {
            setText(e.target.value);
            setCaret(e.target.selectionStart);
            setClosed(false);
          }}
          onSelect={(e) => setCaret(e.currentTarget.selectionStart)}
          onKeyDown={onKeyDown}
        />
        {open && (
          <ul id={listId} role="listbox" aria-label="Members to mention" className="absolute z-10 mt-1 w-64 rounded-md border border-line bg-white py-1 shadow">
            {matches.map((p, i) => (
              <li
                key={p.id}
                id={`${listId}-${i}`}
                role="option"
                aria-selected={i === active}
                className={`cursor-pointer px-3 py-1.5 text-sm ${i === active ? 'bg-brand-light text-brand-dark' : ''}`}
                onMouseDown={(e) => {
                  e.preventDefault();
                  pick(p);
                }}
              >
                {p.name}
              </li>
            ))}
          </ul>
        )}
        <p className="sr-only" aria-live="polite">
          {open ? `${matches.length} ${matches.length === 1 ? 'member matches' : 'members match'}: use the arrow keys and Enter to pick.` : ''}
        </p>
      </div>
      {error && (
        <Alert tone="error" live>
          {error}
        </Alert>
      )}
      <div className="flex gap-2">
        <Button type="submit" disabled={busy}>
          {busy ? 'Saving…' : submitLabel}
        </Button>
        {onCancel && (
          <Button variant="secondary" onClick={onCancel}>
            Cancel
          </Button>
        )}
      </div>
    </form>
  );
}
