import { api } from '@/lib/api/handler';
import { memberDto } from '@/lib/api/dto';
import { listStudyMembers } from '@/lib/data/studies';

export const GET = api<{ studyId: string }>(async ({ actor, params }) => ({
  items: (await listStudyMembers(actor, params.studyId)).map(memberDto),
}));
