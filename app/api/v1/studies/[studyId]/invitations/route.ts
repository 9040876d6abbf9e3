import { api, parseBody } from '@/lib/api/handler';
import { invitationDto } from '@/lib/api/dto';
import { inviteToStudy, listStudyInvitations } from '@/lib/data/invitations';
import { studyInvitationCreateSchema } from '@/lib/validation/member';

type Params = { studyId: string };

export const GET = api<Params>(async ({ actor, params }) => ({
  items: (await listStudyInvitations(actor, params.studyId)).map(invitationDto),
}));

export const POST = api<Params>(
  async ({ req, actor, params }) => {
    const input = await parseBody(req, studyInvitationCreateSchema);
    return invitationDto(await inviteToStudy(actor, params.studyId, input));
  },
  { status: 201 },
);
