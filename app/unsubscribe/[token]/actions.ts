'use server';

import { redirect } from 'next/navigation';
import { unsubscribe } from '@/lib/data/notifications';
import { AppError } from '@/lib/errors';

/** The confirmation page's button: turns the token's kind off, then shows the page again, done. */
export async function unsubscribeAction(token: string): Promise<void> {
  try {
    await unsubscribe(token);
  } catch (err) {
    if (err instanceof AppError && err.code === 'not_found') redirect(`/unsubscribe/${encodeURIComponent(token)}`);
    throw err;
  }
  redirect(`/unsubscribe/${encodeURIComponent(token)}?done=1`);
}
