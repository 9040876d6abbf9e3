import { api } from '@/lib/api/handler';
import { studyDto } from '@/lib/api/dto';
import { setStudyArchived } from '@/lib/data/studies';
import { studyParamsSchema } from '@/lib/validation/params';

export const POST = api(
  async ({ actor, params }) => studyDto(await setStudyArchived(actor, params.studyId, true)),
  { params: studyParamsSchema },
);
