import type { FieldErrors } from './errors';

/** What every server action returns; forms show `message` in an aria-live region. */
export type ActionState =
  | { status: 'idle' }
  | { status: 'success'; message: string }
  | { status: 'error'; message: string; fields?: FieldErrors };

export const idle: ActionState = { status: 'idle' };

/** Only same-site paths are followed after sign-in. */
export function safeCallback(url: string | undefined | null, fallback = '/studies'): string {
  if (!url || !url.startsWith('/') || url.startsWith('//') || url.startsWith('/\\')) return fallback;
  return url;
}
