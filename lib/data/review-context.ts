import 'server-only';
import type { Kysely, Transaction } from 'kysely';
import type { Database } from '@/db/schema';
import { findRevision } from '@/db/repositories/designs';
import { listStudyMembers, type Study } from '@/db/repositories/studies';
import { designSchema, emptyDesign, type Design } from '@/lib/design/schema';
import { runChecks } from '@/lib/rules/registry';
import type { Finding } from '@/lib/rules/types';
import type { Actor } from '@/lib/auth/session';

type Db = Kysely<Database> | Transaction<Database>;

/**
 * What threads and suggestions are read against: the newest revision of the design, its findings
 * and the study's members (names for mentions and e-mails). Internal to lib/data: callers have
 * made their access check already.
 */
export interface ReviewContext {
  revision: number;
  design: Design;
  findings: Finding[];
  names: Map<string, string>;
  members: { userId: string; role: string }[];
}

export async function reviewContext(db: Db, study: Study): Promise<ReviewContext> {
  const rev = study.currentRevision > 0 ? await findRevision(db, study.id, study.currentRevision) : undefined;
  const parsed = designSchema.safeParse(rev?.design ?? {});
  const design = parsed.success ? parsed.data : emptyDesign();
  const members = await listStudyMembers(db, study.id);
  return {
    revision: study.currentRevision,
    design,
    findings: runChecks(design).findings,
    names: new Map(members.map((m) => [m.userId, m.name ?? m.email])),
    members: members.map((m) => ({ userId: m.userId, role: m.role })),
  };
}

export function personName(a: Actor): string {
  return a.name ?? a.email;
}

/** Where the review page shows a thread (the link e-mails carry). */
export function threadPath(studyId: string, threadId: string): string {
  return `/studies/${studyId}/review?thread=${threadId}`;
}
