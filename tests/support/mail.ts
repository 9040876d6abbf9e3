/** Mail captured by the integration tests' stand-in for lib/mail/send. */
export const sentMail: { to: string; subject: string; text: string; html: string }[] = [];

export function linkIn(text: string): string {
  const m = text.match(/https?:\/\/\S+/);
  if (!m) throw new Error(`No link in mail:\n${text}`);
  return m[0];
}
