import { api } from '@/lib/api/handler';
import { activityDto } from '@/lib/api/dto';
import { listStudyActivity } from '@/lib/data/studies';
import { studyParamsSchema } from '@/lib/validation/params';

export const GET = api(
  async ({ actor, params }) => ({
    items: (await listStudyActivity(actor, params.studyId)).map(activityDto),
  }),
  { params: studyParamsSchema },
);
