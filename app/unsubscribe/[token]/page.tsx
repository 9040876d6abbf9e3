import type { Metadata } from 'next';
import Link from 'next/link';
import { Logo } from '@/components/logo';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { readUnsubscribeTarget, type UnsubscribeTarget } from '@/lib/data/notifications';
import { AppError } from '@/lib/errors';
import { KIND_WORDS, NOTIFICATION_KINDS, scopeTopic } from '@/lib/notifications/kinds';
import { unsubscribeAction } from './actions';

export const metadata: Metadata = { title: 'Stop e-mails', robots: { index: false } };
export const dynamic = 'force-dynamic';

/**
 * Where a notification's unsubscribe link leads, without signing in. Opening it changes nothing
 * (mail scanners open links); the button does. Mail programs use the one-click address instead
 * (app/api/v1/unsubscribe/[token]).
 */
export default async function UnsubscribePage({ params, searchParams }: { params: Promise<{ token: string }>; searchParams: Promise<{ done?: string }> }) {
  const { token } = await params;
  const { done } = await searchParams;
  let target: UnsubscribeTarget | null = null;
  try {
    target = await readUnsubscribeTarget(token);
  } catch (err) {
    if (!(err instanceof AppError) || err.code !== 'not_found') throw err;
  }

  let body: React.ReactNode;
  if (!target) {
    body = (
      <>
        <h1 className="text-xl font-bold">This link is not valid</h1>
        <p role="alert">Check that you opened the whole link from the e-mail, or sign in and open Notification settings.</p>
      </>
    );
  } else {
    const topic = scopeTopic(target.scope);
    const kinds = target.scope === 'digest' ? NOTIFICATION_KINDS.filter((k) => target.settings[k] === 'digest') : [target.scope];
    const off = kinds.every((k) => target.settings[k] === 'none');
    body = (
      <>
        <h1 className="text-xl font-bold">Stop e-mails about {topic}</h1>
        {done && off ? (
          <Alert live tone="success" title="Done">
            {target.email} will no longer get e-mails about {topic}.
          </Alert>
        ) : off ? (
          <p>{target.email} does not get e-mails about {topic}.</p>
        ) : (
          <form action={unsubscribeAction.bind(null, token)} className="space-y-4">
            <p>
              Stop sending e-mails about {topic} to <strong>{target.email}</strong>?
              {target.scope === 'digest' && kinds.length > 0 && (
                <> This turns off {kinds.map((k) => KIND_WORDS[k].label.toLowerCase()).join(', ')}.</>
              )}
            </p>
            <Button type="submit">Stop these e-mails</Button>
          </form>
        )}
        <p className="text-muted">
          You can turn them on again, or choose a daily digest instead, in{' '}
          <Link href="/settings/notifications" className="font-semibold text-brand underline">
            Notification settings
          </Link>{' '}
          (after signing in).
        </p>
      </>
    );
  }

  return (
    <div className="flex min-h-screen flex-col items-center px-4 py-10">
      <Logo />
      <main id="main" className="mt-8 w-full max-w-lg space-y-4 rounded-lg border border-line bg-white p-6 text-sm sm:p-8">
        {body}
      </main>
    </div>
  );
}
