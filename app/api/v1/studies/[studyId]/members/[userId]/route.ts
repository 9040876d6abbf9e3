import { api, parseBody } from '@/lib/api/handler';
import { memberDto } from '@/lib/api/dto';
import { changeStudyMemberRole, removeStudyMember } from '@/lib/data/studies';
import { memberRoleUpdateSchema } from '@/lib/validation/member';
import { studyMemberParamsSchema } from '@/lib/validation/params';

export const PATCH = api(
  async ({ req, actor, params }) => {
    const input = await parseBody(req, memberRoleUpdateSchema);
    return { items: (await changeStudyMemberRole(actor, params.studyId, params.userId, input)).map(memberDto) };
  },
  { params: studyMemberParamsSchema },
);

export const DELETE = api(
  async ({ actor, params }) => {
    await removeStudyMember(actor, params.studyId, params.userId);
  },
  { params: studyMemberParamsSchema },
);
