import { api } from '@/lib/api/handler';
import { revokeInvitation } from '@/lib/data/invitations';

export const DELETE = api<{ invitationId: string }>(async ({ actor, params }) => {
  await revokeInvitation(actor, params.invitationId);
});
