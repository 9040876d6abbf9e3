import { api } from '@/lib/api/handler';
import { revokeInvitation } from '@/lib/data/invitations';
import { invitationParamsSchema } from '@/lib/validation/params';

export const DELETE = api(
  async ({ actor, params }) => {
    await revokeInvitation(actor, params.invitationId);
  },
  { params: invitationParamsSchema },
);
