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
