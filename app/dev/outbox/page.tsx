import { formatDateTime } from '@/lib/format';
import type { Metadata } from 'next';
import { headers } from 'next/headers';
import { notFound } from 'next/navigation';
import { Logo } from '@/components/logo';
import { isLocalRequest, outboxDir, readOutbox } from '@/lib/outbox';

export const metadata: Metadata = { title: 'Outbox (development)' };
export const dynamic = 'force-dynamic';

/** Turns the URLs in a plain-text mail into links. */
function Linked({ text }: { text: string }) {
  const parts = text.split(/(https?:\/\/[^\s]+)/g);
  return (
    <>
      {parts.map((p, i) =>
        /^https?:\/\//.test(p) ? (
          <a key={i} href={p} className="break-all text-brand underline">
            {p}
          </a>
        ) : (
          <span key={i}>{p}</span>
        ),
      )}
    </>
  );
}

export default async function OutboxPage({ searchParams }: { searchParams: Promise<{ to?: string }> }) {
  // Every reset and sign-in link is listed here: for anyone but this machine, the page does not exist.
  if (!outboxDir() || !isLocalRequest(await headers())) notFound();
  const { to } = await searchParams;
  const messages = (await readOutbox()).filter((m) => !to || m.to.some((t) => t.toLowerCase().includes(to.toLowerCase())));
  return (
    <div className="mx-auto max-w-4xl px-4 py-8">
      <Logo />
      <main id="main" className="mt-6 space-y-4">
        <h1 className="text-2xl font-bold">Outbox</h1>
        <p className="text-sm text-muted">
          Development only: every e-mail the app sends goes to the local mail sink and appears here, newest first. Production servers
          send through the SMTP server in their settings and have no outbox.
        </p>
        <form className="flex items-end gap-2" role="search">
          <div>
            <label htmlFor="outbox-to" className="block text-sm font-semibold">
              Recipient contains
            </label>
            <input id="outbox-to" name="to" defaultValue={to} className="mt-1 rounded-md border border-line bg-white px-3 py-2 text-sm" />
          </div>
          <button type="submit" className="rounded-md bg-brand px-4 py-2 text-sm font-semibold text-white">
            Filter
          </button>
        </form>
        {messages.length === 0 && <p>No messages yet.</p>}
        <ol className="space-y-4">
          {messages.map((m) => (
            <li key={m.id}>
              <article aria-label={m.subject} className="rounded-lg border border-line bg-white p-4">
                <h2 className="font-bold">{m.subject}</h2>
                <p className="text-sm text-muted">
                  To {m.to.join(', ')} · <time dateTime={m.receivedAt}>{formatDateTime(m.receivedAt)}</time>
                </p>
                {m.headers && (
                  <dl className="mt-2 text-xs text-muted">
                    {Object.entries(m.headers).map(([name, value]) => (
                      <div key={name} className="break-all">
                        <dt className="inline font-semibold">{name}:</dt> <dd className="inline">{value}</dd>
                      </div>
                    ))}
                  </dl>
                )}
                <pre className="mt-3 whitespace-pre-wrap font-sans text-sm">
                  <Linked text={m.text} />
                </pre>
              </article>
            </li>
          ))}
        </ol>
      </main>
    </div>
  );
}
