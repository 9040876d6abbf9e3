/**
 * The kinds of review notification and how each can be delivered: the words the settings page,
 * the unsubscribe page and the e-mails use, and each kind's default. No server code here, so the
 * settings form can import it.
 *
 * Defaults: a mention, a suggestion waiting for your decision, a decision on your suggestion, a
 * sign-off and its withdrawal each ask something of one person or change the study's standing,
 * so they go out at once. Replies come in bursts (a conversation in a thread is many replies in
 * an hour), and one message per reply would bury the ones that need action; they are gathered
 * into the daily digest unless a person chooses otherwise.
 */
import type { NotificationDelivery } from '@/db/schema';

export const NOTIFICATION_KINDS = ['mention', 'reply', 'suggestion', 'decision', 'signoff', 'withdrawal'] as const;
export type NotificationKind = (typeof NOTIFICATION_KINDS)[number];

export const DELIVERIES = ['immediate', 'digest', 'none'] as const satisfies readonly NotificationDelivery[];
export type Delivery = NotificationDelivery;

export const DEFAULT_DELIVERY: Record<NotificationKind, Delivery> = {
  mention: 'immediate',
  reply: 'digest',
  suggestion: 'immediate',
  decision: 'immediate',
  signoff: 'immediate',
  withdrawal: 'immediate',
};

export interface KindWords {
  /** Settings page label. */
  label: string;
  /** One line under the label. */
  description: string;
  /** Finishes "You got this because …". */
  reason: string;
  /** Finishes "Stop e-mails about …". */
  topic: string;
}

export const KIND_WORDS: Record<NotificationKind, KindWords> = {
  mention: {
    label: 'Mentions',
    description: 'Someone mentions you with @ in a comment.',
    reason: 'someone mentioned you in a comment',
    topic: 'mentions of you',
  },
  reply: {
    label: 'Replies in your threads',
    description: 'Someone replies in a thread you started or took part in.',
    reason: 'someone replied in a thread you take part in',
    topic: 'replies in your threads',
  },
  suggestion: {
    label: 'Suggestions to decide',
    description: 'A consultant suggests a change to a design you can edit.',
    reason: 'a change was suggested that you can accept or decline',
    topic: 'suggestions to decide',
  },
  decision: {
    label: 'Decisions on your suggestions',
    description: 'Your suggestion is accepted or declined.',
    reason: 'a suggestion of yours was accepted or declined',
    topic: 'decisions on your suggestions',
  },
  signoff: {
    label: 'Sign-offs',
    description: 'A consultant signs off a version of a study you belong to.',
    reason: 'a version of a study you belong to was signed off',
    topic: 'sign-offs',
  },
  withdrawal: {
    label: 'Withdrawn sign-offs',
    description: 'A consultant withdraws a sign-off.',
    reason: 'a sign-off on a study you belong to was withdrawn',
    topic: 'withdrawn sign-offs',
  },
};

export const DELIVERY_WORDS: Record<Delivery, { label: string; description: string }> = {
  immediate: { label: 'At once', description: 'One e-mail for each event, as it happens.' },
  digest: { label: 'Daily digest', description: 'One e-mail a day, grouped by study.' },
  none: { label: 'None', description: 'No e-mail.' },
};

/** What an unsubscribe link is for: one kind, or everything a person receives in the daily digest. */
export const UNSUBSCRIBE_SCOPES = [...NOTIFICATION_KINDS, 'digest'] as const;
export type UnsubscribeScope = (typeof UNSUBSCRIBE_SCOPES)[number];

export function scopeTopic(scope: UnsubscribeScope): string {
  return scope === 'digest' ? 'the daily digest' : KIND_WORDS[scope].topic;
}

export type NotificationSettings = Record<NotificationKind, Delivery>;

/** A person's stored choices over the defaults. */
export function withDefaults(stored: Partial<Record<string, Delivery>>): NotificationSettings {
  const out = { ...DEFAULT_DELIVERY };
  for (const kind of NOTIFICATION_KINDS) {
    const d = stored[kind];
    if (d) out[kind] = d;
  }
  return out;
}

/** The hour (UTC) from which each day's digest goes out: it gathers what happened before then. */
export const DIGEST_HOUR_UTC = 7;
