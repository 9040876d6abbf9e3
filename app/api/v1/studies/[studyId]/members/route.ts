import { api } from '@/lib/api/handler';
import { memberDto } from '@/lib/api/dto';
import { listStudyMembers } from '@/lib/data/studies';
import { studyParamsSchema } from '@/lib/validation/params';

export const GET = api(
  async ({ actor, params }) => ({
    items: (await listStudyMembers(actor, params.studyId)).map(memberDto),
  }),
  { params: studyParamsSchema },
);
