'use server';

import { redirect } from 'next/navigation';
import { currentActor } from '@/lib/auth/session';
import { acceptInvitation } from '@/lib/data/invitations';
import { toAppError } from '@/lib/errors';
import type { ActionState } from '@/lib/action-state';

export async function acceptInvitationAction(token: string): Promise<ActionState> {
  let target: string;
  try {
    const joined = await acceptInvitation(await currentActor(), String(token ?? ''));
    target = joined.studyId ? `/studies/${joined.studyId}` : `/workspaces/${joined.workspaceId}`;
  } catch (err) {
    const e = toAppError(err);
    return { status: 'error', message: e.message };
  }
  redirect(target);
}
