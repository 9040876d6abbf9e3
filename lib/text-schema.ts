import { z } from 'zod';
import { sentenceLabel } from './field-messages';

/**
 * Every string a client sends starts from `rawText` (as sent) or `text` (trimmed, no control
 * characters). Both refuse the two things that are not text anyone can store or show: NUL, which
 * PostgreSQL refuses in text and JSON, and half of a UTF-16 surrogate pair, which is not a
 * character at all (JSON can carry one, PostgreSQL's JSON refuses it and UTF-8 cannot encode it).
 * lib/validation/strings.test.ts walks every input schema and fails on a string that
 * does not start here.
 *
 * A leaf: it imports only the leaf lib/field-messages.ts (whose import installs the app's zod error
 * map wherever a schema exists) and nothing else of the app, so the engine's contracts (lib/sim/spec.ts,
 * lib/stats/calculations/request.ts), the design schema and the request envelopes in
 * lib/validation all build on it.
 */
const NUL = '\u0000';
const LONE_SURROGATE = /\p{Cs}/u;
const OTHER_CONTROL = /[\u0001-\u0008\u000B\u000C\u000E-\u001F\u007F]/;

/** A string kept as sent (passwords, tokens, machine keys): only NUL and broken characters are refused. */
export function rawText(name: string, missing = `${sentenceLabel(name)} must be text.`) {
  const label = sentenceLabel(name);
  return z
    .string({ error: missing })
    .refine((v) => !v.includes(NUL), `${label} contains an invisible NUL character: remove it.`)
    .refine((v) => !LONE_SURROGATE.test(v), `${label} contains a broken character (half of an emoji or symbol): retype it or remove it.`);
}

/** Trimmed text with a length range; control characters other than newline and tab are refused. */
export function text(name: string, min: number, max: number) {
  const label = sentenceLabel(name);
  return rawText(name)
    .trim()
    .min(min, min === 1 ? `${label} is required.` : `${label} needs at least ${min} characters.`)
    .max(max, `${label} can be at most ${max} characters.`)
    .refine((v) => !OTHER_CONTROL.test(v), `${label} contains control characters: remove them.`);
}
