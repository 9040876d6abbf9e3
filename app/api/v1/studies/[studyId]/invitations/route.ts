import { api, parseBody } from '@/lib/api/handler';
import { invitationDto } from '@/lib/api/dto';
import { inviteToStudy, listStudyInvitations } from '@/lib/data/invitations';
import { studyInvitationCreateSchema } from '@/lib/validation/member';
import { studyParamsSchema } from '@/lib/validation/params';

export const GET = api(
  async ({ actor, params }) => ({
    items: (await listStudyInvitations(actor, params.studyId)).map(invitationDto),
  }),
  { params: studyParamsSchema },
);

export const POST = api(
  async ({ req, actor, params }) => {
    const input = await parseBody(req, studyInvitationCreateSchema);
    return invitationDto(await inviteToStudy(actor, params.studyId, input));
  },
  { params: studyParamsSchema, status: 201 },
);
