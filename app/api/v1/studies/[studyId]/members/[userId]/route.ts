import { api, parseBody } from '@/lib/api/handler';
import { memberDto } from '@/lib/api/dto';
import { changeStudyMemberRole, removeStudyMember } from '@/lib/data/studies';
import { memberRoleUpdateSchema } from '@/lib/validation/member';

type Params = { studyId: string; userId: string };

export const PATCH = api<Params>(async ({ req, actor, params }) => {
  const input = await parseBody(req, memberRoleUpdateSchema);
  return { items: (await changeStudyMemberRole(actor, params.studyId, params.userId, input)).map(memberDto) };
});

export const DELETE = api<Params>(async ({ actor, params }) => {
  await removeStudyMember(actor, params.studyId, params.userId);
});
