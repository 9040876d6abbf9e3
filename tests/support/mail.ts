/** Mail captured by the integration tests' stand-in for lib/mail/send. */
export const sentMail: { to: string; subject: string; text: string; html: string; messageId?: string; headers?: Record<string, string> }[] = [];

/**
 * The stand-in SMTP server: `down` makes every send fail as if the server could not be reached;
 * `latencyMs` makes every send take that long, as a real server's dialogue does.
 */
export const smtp = { down: false, latencyMs: 0 };

export function linkIn(text: string): string {
  const m = text.match(/https?:\/\/\S+/);
  if (!m) throw new Error(`No link in mail:\n${text}`);
  return m[0];
}
