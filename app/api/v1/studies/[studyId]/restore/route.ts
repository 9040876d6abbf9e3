import { api } from '@/lib/api/handler';
import { studyDto } from '@/lib/api/dto';
import { setStudyArchived } from '@/lib/data/studies';

export const POST = api<{ studyId: string }>(async ({ actor, params }) => studyDto(await setStudyArchived(actor, params.studyId, false)));
