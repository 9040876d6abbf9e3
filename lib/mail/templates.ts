/**
 * The e-mails Unitwise sends, as plain text with a simple HTML twin. Every link is absolute.
 */
import type { Mail } from './send';

function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}

function layout(to: string, subject: string, paragraphs: string[], link?: { href: string; label: string }): Mail {
  const text = [...paragraphs, ...(link ? [`${link.label}: ${link.href}`] : []), '', '— Unitwise'].join('\n\n');
  const html = [
    '<div style="font-family:system-ui,sans-serif;font-size:15px;line-height:1.5;color:#172033;max-width:560px">',
    ...paragraphs.map((p) => `<p>${escapeHtml(p)}</p>`),
    link
      ? `<p><a href="${escapeHtml(link.href)}" style="background:#1f5f8b;color:#fff;padding:10px 16px;border-radius:6px;text-decoration:none">${escapeHtml(link.label)}</a></p><p style="font-size:13px;color:#4a5568">Or paste this address into your browser: ${escapeHtml(link.href)}</p>`
      : '',
    '<p style="color:#4a5568">— Unitwise</p></div>',
  ].join('');
  return { to, subject, text, html };
}

export function verifyEmailMail(to: string, name: string, href: string): Mail {
  return layout(
    to,
    'Confirm your e-mail address for Unitwise',
    [`Hello ${name},`, 'Confirm this address to finish creating your Unitwise account. The link works once and expires in 24 hours.'],
    { href, label: 'Confirm e-mail address' },
  );
}

export function alreadyRegisteredMail(to: string, signInHref: string, resetHref: string): Mail {
  return layout(to, 'Someone tried to create a Unitwise account with your address', [
    'An account with this e-mail address already exists, so no new account was created.',
    `If it was you, sign in at ${signInHref}, or reset your password at ${resetHref}.`,
    'If it was not you, you can ignore this message; your account is unchanged.',
  ]);
}

export function resetPasswordMail(to: string, href: string): Mail {
  return layout(
    to,
    'Reset your Unitwise password',
    [
      'We received a request to reset the password of your Unitwise account.',
      'The link works once and expires in 60 minutes. Resetting signs you out everywhere.',
      'If you did not ask for this, ignore this message; your password stays as it is.',
    ],
    { href, label: 'Choose a new password' },
  );
}

export function magicLinkMail(to: string, href: string): Mail {
  return layout(
    to,
    'Your sign-in link for Unitwise',
    ['Use this link to sign in to Unitwise. It works once and expires in 15 minutes.', 'If you did not ask for it, ignore this message.'],
    { href, label: 'Sign in to Unitwise' },
  );
}

export function invitationMail(
  to: string,
  inviter: string,
  place: string,
  roleSentence: string,
  href: string,
): Mail {
  return layout(
    to,
    `${inviter} invited you to ${place} on Unitwise`,
    [`${inviter} invited you to ${place} on Unitwise.`, roleSentence, 'The invitation works once and expires in 7 days.'],
    { href, label: 'Open the invitation' },
  );
}

/** A paragraph of plain text in which addresses become links in the HTML twin. */
function linkedHtml(s: string): string {
  return s
    .split(/(https?:\/\/\S+)/g)
    .map((part) => (/^https?:\/\//.test(part) ? `<a href="${escapeHtml(part)}">${escapeHtml(part)}</a>` : escapeHtml(part)))
    .join('');
}

/**
 * A notification: what happened (paragraphs, the first naming the study), a button into the app,
 * and a footer saying why the person got it and how to change that, with the unsubscribe link.
 */
function notificationLayout(to: string, subject: string, body: string[], link: { href: string; label: string }, footer: string[], headers: Record<string, string>): Mail {
  const text = [...body, `${link.label}: ${link.href}`, '—', ...footer].join('\n\n');
  const html = [
    '<div style="font-family:system-ui,sans-serif;font-size:15px;line-height:1.5;color:#172033;max-width:560px">',
    ...body.map((p) => `<p style="white-space:pre-wrap">${escapeHtml(p)}</p>`),
    `<p><a href="${escapeHtml(link.href)}" style="background:#1f5f8b;color:#fff;padding:10px 16px;border-radius:6px;text-decoration:none">${escapeHtml(link.label)}</a></p>`,
    `<p style="font-size:13px;color:#4a5568">Or paste this address into your browser: ${escapeHtml(link.href)}</p>`,
    '<hr style="border:none;border-top:1px solid #d8dee8">',
    ...footer.map((p) => `<p style="font-size:13px;color:#4a5568">${linkedHtml(p)}</p>`),
    '</div>',
  ].join('');
  return { to, subject, text, html, headers };
}

export interface NotificationMailInput {
  to: string;
  subject: string;
  studyTitle: string;
  /** The event's own text: what happened, quoted where useful. */
  text: string;
  href: string;
  /** Finishes "You got this because …" (lib/notifications/kinds.ts). */
  reason: string;
  /** Finishes "Stop e-mails about …". */
  topic: string;
  unsubscribeHref: string;
  settingsHref: string;
  headers: Record<string, string>;
}

export function notificationMail(n: NotificationMailInput): Mail {
  return notificationLayout(
    n.to,
    n.subject,
    [`Study: ${n.studyTitle}`, n.text],
    { href: n.href, label: 'Open in Unitwise' },
    [
      `You got this e-mail because ${n.reason} on "${n.studyTitle}", and you chose to hear about it at once.`,
      `Stop e-mails about ${n.topic} (no sign-in needed): ${n.unsubscribeHref}`,
      `Choose at once, a daily digest or none for each kind of e-mail: ${n.settingsHref}`,
    ],
    n.headers,
  );
}

export interface DigestStudy {
  title: string;
  href: string;
  items: { subject: string; when: string; href: string }[];
}

export function digestMail(n: {
  to: string;
  studies: DigestStudy[];
  count: number;
  unsubscribeHref: string;
  settingsHref: string;
  headers: Record<string, string>;
}): Mail {
  const subject = `Your Unitwise digest: ${n.count === 1 ? 'one update' : `${n.count} updates`} on ${n.studies.length === 1 ? `"${n.studies[0]!.title}"` : `${n.studies.length} studies`}`;
  const body = n.studies.map((s) => [`Study: ${s.title}`, ...s.items.map((i) => `• ${i.subject} (${i.when})\n  ${i.href}`)].join('\n'));
  return notificationLayout(
    n.to,
    subject,
    ['Here is what happened in your studies since your last digest.', ...body],
    { href: n.studies[0]!.href, label: n.studies.length === 1 ? 'Open the study' : 'Open the first study' },
    [
      'You got this e-mail because you chose a daily digest for some kinds of notification.',
      `Stop the daily digest (no sign-in needed): ${n.unsubscribeHref}`,
      `Choose at once, a daily digest or none for each kind of e-mail: ${n.settingsHref}`,
    ],
    n.headers,
  );
}
