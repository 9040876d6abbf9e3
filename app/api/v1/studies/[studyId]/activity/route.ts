import { api } from '@/lib/api/handler';
import { activityDto } from '@/lib/api/dto';
import { listStudyActivity } from '@/lib/data/studies';

export const GET = api<{ studyId: string }>(async ({ actor, params }) => ({
  items: (await listStudyActivity(actor, params.studyId)).map(activityDto),
}));
