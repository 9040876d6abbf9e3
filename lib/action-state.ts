import type { FieldErrors } from './errors';

/** What every server action returns; forms show `message` in an aria-live region. */
export type ActionState =
  | { status: 'idle' }
  | { status: 'success'; message: string }
  | { status: 'error'; message: string; fields?: FieldErrors };

export const idle: ActionState = { status: 'idle' };

const OWN_ORIGIN = 'http://unitwise.invalid';

/**
 * Only same-site paths are followed after sign-in. The path is read the way a browser reads a
 * Location header (which drops tabs and line breaks and takes "\\" for "/"), so that "/\t/evil.example"
 * cannot become "//evil.example"; what is returned is that reading, not the raw text.
 */
export function safeCallback(url: string | undefined | null, fallback = '/studies'): string {
  if (!url || !url.startsWith('/')) return fallback;
  let parsed: URL;
  try {
    parsed = new URL(url, OWN_ORIGIN);
  } catch {
    return fallback;
  }
  if (parsed.origin !== OWN_ORIGIN) return fallback;
  return `${parsed.pathname}${parsed.search}${parsed.hash}`;
}
