import { api, parseBody } from '@/lib/api/handler';
import { acceptInvitation } from '@/lib/data/invitations';
import { invitationAcceptSchema } from '@/lib/validation/workspace';

export const POST = api(async ({ req, actor }) => {
  const { token } = await parseBody(req, invitationAcceptSchema);
  return acceptInvitation(actor, token);
});
