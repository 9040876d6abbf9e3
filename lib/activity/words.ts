/**
 * The activity log in words: one sentence per action name (activity_log.action), the kinds of
 * event the activity view filters by, and the patterns that select each kind in SQL. Every view
 * of the log (the study overview, the review's activity page, the CSV export, the API's
 * `summary`) takes its words from here. Actions are logged by the code that does the write
 * (names in the issue-12 brief); an action this file does not know still reads as a sentence.
 */
import { plural } from '@/lib/format';

export interface ActivityLike {
  action: string;
  details: Record<string, unknown>;
}

function str(d: Record<string, unknown>, key: string): string | undefined {
  const v = d[key];
  if (typeof v === 'string' && v.trim()) return v.trim().length > 120 ? `${v.trim().slice(0, 119)}…` : v.trim();
  if (typeof v === 'number' && Number.isFinite(v)) return String(v);
  return undefined;
}

const quoted = (s: string | undefined, before = ': ') => (s ? `${before}“${s}”` : '');

type Words = (d: Record<string, unknown>) => string;

const VERSION = (d: Record<string, unknown>) => {
  const name = str(d, 'name') ?? str(d, 'versionName');
  const number = str(d, 'version') ?? str(d, 'versionNumber') ?? str(d, 'number');
  if (name) return `version “${name}”`;
  return number ? `version ${number}` : 'a version';
};

const WORDS: Record<string, Words> = {
  'study.created': () => 'created the study',
  'study.updated': () => 'edited the study details',
  'study.archived': () => 'archived the study',
  'study.restored': () => 'restored the study from the archive',
  'design.saved': (d) => (str(d, 'revision') ? `saved the design (save ${str(d, 'revision')})` : 'saved the design'),
  'version.named': (d) => `named ${VERSION({ ...d, name: undefined })}${quoted(str(d, 'name'), ' ')}`,
  'version.restored': (d) => `restored ${VERSION(d)} as a new version`,
  'comment.created': (d) => `commented${str(d, 'anchorLabel') ? ` on ${str(d, 'anchorLabel')}` : ''}${quoted(str(d, 'excerpt'))}`,
  'comment.replied': (d) => `replied in a thread${quoted(str(d, 'excerpt'))}`,
  'comment.resolved': () => 'resolved a thread',
  'comment.reopened': () => 'reopened a thread',
  'suggestion.created': (d) => `suggested a change${str(d, 'fieldLabel') ? ` to ${str(d, 'fieldLabel')}` : ''}${quoted(str(d, 'after'), ' → ')}`,
  'suggestion.accepted': (d) => `accepted a suggestion${str(d, 'fieldLabel') ? ` to ${str(d, 'fieldLabel')}` : ''}`,
  'suggestion.declined': (d) => `declined a suggestion${str(d, 'fieldLabel') ? ` to ${str(d, 'fieldLabel')}` : ''}${quoted(str(d, 'reason'))}`,
  'signoff.created': (d) => `signed off ${VERSION(d)}`,
  'signoff.withdrawn': (d) => `withdrew the sign-off of ${VERSION(d)}${quoted(str(d, 'reason'))}`,
  'finding.addressed': () => 'marked a finding addressed',
  'finding.reopened': () => 'reopened a finding',
  'plan.saved': () => 'saved a sample-size result',
  'simulation.started': () => 'started a stress test',
  'simulation.cancelled': () => 'cancelled a stress test',
  'invitation.created': (d) => `sent an invitation${str(d, 'email') ? ` to ${str(d, 'email')}` : ''}`,
  'invitation.resent': () => 'sent an invitation again',
  'invitation.accepted': () => 'accepted an invitation',
  'invitation.revoked': () => 'revoked an invitation',
  'member.role-changed': (d) => `changed a member’s role${str(d, 'from') && str(d, 'to') ? ` from ${str(d, 'from')} to ${str(d, 'to')}` : ''}`,
  'member.removed': () => 'removed a member',
  'activity.exported': (d) => `downloaded the activity log${typeof d.rows === 'number' ? ` (${plural(d.rows, 'entry')})` : ''}`,
  'justification.exported': () => 'exported the justification',
};

/** What the person did, as the end of a sentence that starts with their name. */
export function describeActivity(item: ActivityLike): string {
  const words = WORDS[item.action];
  if (words) return words(item.details ?? {});
  // An action named since this file was written: its name in words, never nothing.
  const plain = item.action.replace(/[._-]+/g, ' ').trim();
  return plain ? `recorded “${plain}”` : 'made a change';
}

/** Whether `describeActivity` has words of its own for an action (tests). */
export function knowsAction(action: string): boolean {
  return action in WORDS;
}

/** The kinds of event the activity view filters by, each with SQL LIKE patterns on the action. */
export const ACTIVITY_KINDS = {
  edits: { label: 'Edits and versions', patterns: ['design.%', 'version.%', 'study.%'] },
  comments: { label: 'Comments', patterns: ['comment.%'] },
  suggestions: { label: 'Suggestions and decisions', patterns: ['suggestion.%'] },
  signoffs: { label: 'Sign-offs', patterns: ['signoff.%'] },
  findings: { label: 'Findings', patterns: ['finding.%'] },
  runs: { label: 'Calculations and stress tests', patterns: ['plan.%', 'simulation.%'] },
  uploads: { label: 'Uploads', patterns: ['upload.%', '%.uploaded'] },
  exports: { label: 'Exports', patterns: ['%.exported'] },
  members: { label: 'Members and invitations', patterns: ['member.%', 'invitation.%'] },
} as const satisfies Record<string, { label: string; patterns: readonly string[] }>;

export type ActivityKind = keyof typeof ACTIVITY_KINDS;
export const ACTIVITY_KIND_IDS = Object.keys(ACTIVITY_KINDS) as ActivityKind[];

/** A person's name as the log shows it. */
export function actorWords(item: { actorName: string | null; actorEmail: string | null }): string {
  return item.actorName ?? item.actorEmail ?? 'Someone';
}
