import { api } from '@/lib/api/handler';
import { invitationDto } from '@/lib/api/dto';
import { resendInvitation } from '@/lib/data/invitations';
import { invitationParamsSchema } from '@/lib/validation/params';

/** POST: send a pending invitation again with a new link (the old link stops working). */
export const POST = api(async ({ actor, params }) => invitationDto(await resendInvitation(actor, params.invitationId)), {
  params: invitationParamsSchema,
});
