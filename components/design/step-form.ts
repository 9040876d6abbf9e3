'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import { useEffect, useRef } from 'react';
import { useForm, type DefaultValues, type FieldValues, type Resolver } from 'react-hook-form';
import type { z } from 'zod';

/**
 * A wizard step's form: react-hook-form with the part's zod schema (the same schema the server
 * uses). Every change is validated; a valid part is handed to `onValid` (which autosaves), an
 * invalid one shows its field errors and is kept as a draft.
 */
export function useStepForm<T extends FieldValues>(schema: z.ZodType, value: T, onValid: (v: T) => void, onDraft: (valid: boolean) => void) {
  const form = useForm<T>({
    resolver: zodResolver(schema as never) as unknown as Resolver<T>,
    defaultValues: value as DefaultValues<T>,
    mode: 'onChange',
  });
  const latest = useRef({ onValid, onDraft });
  latest.current = { onValid, onDraft };
  useEffect(() => {
    const sub = form.watch((values) => {
      const parsed = schema.safeParse(values);
      latest.current.onDraft(parsed.success);
      if (parsed.success) latest.current.onValid(parsed.data as T);
      else void form.trigger();
    });
    return () => sub.unsubscribe();
  }, [form, schema]);
  return form;
}

/** register() options for a number input: empty stays undefined instead of NaN. */
export const asNumber = { setValueAs: (v: unknown) => (v === '' || v === null || v === undefined ? undefined : Number(v)) };

/** register() options for an optional choice: the empty "Choose…" option means not chosen yet. */
export const asOptional = { setValueAs: (v: unknown) => (v === '' || v === null ? undefined : v) };

/** A short id from a name, unique among `taken`. */
export function makeId(name: string, taken: string[]): string {
  const base =
    name
      .toLowerCase()
      .replace(/[^a-z0-9]+/g, '-')
      .replace(/^-+|-+$/g, '')
      .slice(0, 30) || 'level';
  let id = base;
  for (let i = 2; taken.includes(id); i++) id = `${base}-${i}`;
  return id;
}

type Errors = Record<string, unknown> | undefined;
/** Reads a nested error message by dotted path. */
export function errorAt(errors: Errors, path: string): string | undefined {
  let cur: unknown = errors;
  for (const k of path.split('.')) cur = (cur as Record<string, unknown> | undefined)?.[k];
  return (cur as { message?: string } | undefined)?.message;
}
