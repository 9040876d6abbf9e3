import { cookies } from 'next/headers';
import { redirect } from 'next/navigation';
import { currentActor } from '@/lib/auth/session';
import { listMyWorkspaces } from '@/lib/data/workspaces';

/** Opens the last workspace used, or the first one. */
export default async function StudiesIndex() {
  const actor = await currentActor();
  if (!actor) redirect('/sign-in?callbackUrl=%2Fstudies');
  const workspaces = await listMyWorkspaces(actor);
  const last = (await cookies()).get('uw-workspace')?.value;
  const target = workspaces.find((w) => w.id === last) ?? workspaces[0];
  if (!target) redirect('/workspaces/new');
  redirect(`/workspaces/${target.id}`);
}
