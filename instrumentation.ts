/**
 * Runs once when a Next.js server starts (not during `next build`). On the Node.js runtime it
 * starts the mail sender (lib/mail/sender.ts) in the background: the server does not wait for the
 * database, and mail queued meanwhile is sent once the sender is subscribed.
 */
export async function register(): Promise<void> {
  if (process.env.NEXT_RUNTIME !== 'nodejs') return;
  const { startMailSender } = await import('./lib/mail/sender');
  void startMailSender();
}
