/**
 * @mentions inside a comment. A comment stores a mention as `<@user id>` — an id, so that a
 * member who changes their name is still the one mentioned — and shows it as "@Name". The
 * composer writes the token when a member is picked from the list; the server keeps only
 * members of the study.
 */
const MENTION = /<@([0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12})>/gi;

export function mentionToken(userId: string): string {
  return `<@${userId}>`;
}

/** The ids mentioned in a comment, each once, in the order they first appear. */
export function mentionedIds(body: string): string[] {
  return [...new Set([...body.matchAll(MENTION)].map((m) => m[1]!.toLowerCase()))];
}

export type CommentPart = { kind: 'text'; text: string } | { kind: 'mention'; userId: string; name: string };

/** The comment split into text and mentions, a mention named by `names` (or "someone" for a former member). */
export function commentParts(body: string, names: ReadonlyMap<string, string>): CommentPart[] {
  const parts: CommentPart[] = [];
  let last = 0;
  for (const m of body.matchAll(MENTION)) {
    if (m.index > last) parts.push({ kind: 'text', text: body.slice(last, m.index) });
    const userId = m[1]!.toLowerCase();
    parts.push({ kind: 'mention', userId, name: names.get(userId) ?? 'someone' });
    last = m.index + m[0].length;
  }
  if (last < body.length) parts.push({ kind: 'text', text: body.slice(last) });
  return parts;
}

/** The comment as plain text, mentions written "@Name" (e-mails, excerpts). */
export function commentText(body: string, names: ReadonlyMap<string, string>): string {
  return commentParts(body, names)
    .map((p) => (p.kind === 'text' ? p.text : `@${p.name}`))
    .join('');
}

/** The first words of a comment, for a list or an e-mail subject. */
export function excerpt(text: string, max = 120): string {
  const flat = text.replace(/\s+/g, ' ').trim();
  return flat.length <= max ? flat : `${flat.slice(0, max - 1).trimEnd()}…`;
}
