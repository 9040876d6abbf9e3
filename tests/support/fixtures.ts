/**
 * Builders for integration tests: users with sessions, a workspace with one study member per
 * role, and Requests that carry a session cookie the way a browser would.
 */
import { randomBytes } from 'node:crypto';
import type { StudyRole } from '@/db/schema';
import { insertRevision, insertStudy, upsertStudyMember } from '@/db/repositories/studies';
import { insertSession, insertUser } from '@/db/repositories/users';
import { insertWorkspace, upsertWorkspaceMember } from '@/db/repositories/workspaces';
import { db } from '@/lib/db';
import type { SimulationSpecInput } from '@/lib/sim/spec';

export const BASE = 'http://localhost:3100';

export interface TestUser {
  id: string;
  email: string;
  cookie: string;
}

let counter = 0;

export async function makeUser(label: string): Promise<TestUser> {
  counter += 1;
  const email = `${label}.${counter}@test.example`;
  const u = await insertUser(db(), { name: `${label} ${counter}`, email, emailVerified: new Date() });
  const token = randomBytes(24).toString('base64url');
  await insertSession(db(), { userId: u.id, sessionToken: token, expires: new Date(Date.now() + 3600_000) });
  return { id: u.id, email, cookie: `authjs.session-token=${token}` };
}

export interface World {
  workspaceId: string;
  studyId: string;
  /** One member per study role, all in the study's workspace. */
  byRole: Record<StudyRole, TestUser>;
  /** A member of the workspace who is not a member of the study. */
  workspaceOnly: TestUser;
  /** Admin of another workspace, no membership here. */
  outsider: TestUser;
  outsiderWorkspaceId: string;
  /** A second editor on the study, a target for role changes and removal. */
  target: TestUser;
}

export async function makeWorld(): Promise<World> {
  const roles: StudyRole[] = ['owner', 'editor', 'consultant', 'writer', 'viewer'];
  const byRole = {} as Record<StudyRole, TestUser>;
  for (const r of roles) byRole[r] = await makeUser(r);
  const workspaceOnly = await makeUser('wsmember');
  const target = await makeUser('target');
  const outsider = await makeUser('outsider');

  const ws = await insertWorkspace(db(), { name: 'Harrow Vale Institute', createdBy: byRole.owner.id });
  await upsertWorkspaceMember(db(), ws.id, byRole.owner.id, 'admin');
  for (const u of [byRole.editor, byRole.consultant, byRole.writer, byRole.viewer, workspaceOnly, target]) {
    await upsertWorkspaceMember(db(), ws.id, u.id, 'member');
  }
  const study = await insertStudy(db(), { workspaceId: ws.id, title: 'Reading-support programme', description: '', createdBy: byRole.owner.id });
  for (const r of roles) await upsertStudyMember(db(), study.id, byRole[r].id, r);
  await upsertStudyMember(db(), study.id, target.id, 'editor');
  await insertRevision(db(), { studyId: study.id, number: 1, design: { schemaVersion: 1 }, authorId: byRole.owner.id });

  const other = await insertWorkspace(db(), { name: 'Elsewhere Lab', createdBy: outsider.id });
  await upsertWorkspaceMember(db(), other.id, outsider.id, 'admin');
  return { workspaceId: ws.id, studyId: study.id, byRole, workspaceOnly, outsider, outsiderWorkspaceId: other.id, target };
}

export function request(
  method: string,
  path: string,
  options: { user?: TestUser | null; body?: unknown; headers?: Record<string, string> } = {},
): Request {
  const headers: Record<string, string> = { ...options.headers };
  if (options.user) headers.cookie = options.user.cookie;
  if (options.body !== undefined) headers['content-type'] = 'application/json';
  if (method !== 'GET') {
    headers.origin ??= BASE;
    headers['sec-fetch-site'] ??= 'same-origin';
  }
  return new Request(`${BASE}${path}`, {
    method,
    headers,
    body: options.body !== undefined ? JSON.stringify(options.body) : undefined,
  });
}

export function ctx<P extends Record<string, string>>(params: P) {
  return { params: Promise.resolve(params) };
}

/** A stress-test specification small enough to run in a test: 2 × 4 clusters of 5, two scenarios, 100 replicates. */
export const SMALL_SPEC: SimulationSpecInput = {
  design: { arms: 2, clustersPerArm: 4, clusterSize: 5 },
  truth: { effect: 0.8, sd: 1, icc: 0.1 },
  scenarios: [{ violation: 'none' }, { violation: 'skewed' }],
  analyses: ['ols', 'cluster-robust', 'mixed'],
  replicates: 100,
  seed: 7,
};
