import { api, parseBody } from '@/lib/api/handler';
import { addFindingNote, listFindingNotes, type FindingNote } from '@/lib/data/designs';
import { findingNoteSchema } from '@/lib/validation/design';

type Params = { studyId: string };

const dto = (n: FindingNote) => ({ ...n, createdAt: n.createdAt.toISOString() });

export const GET = api<Params>(async ({ actor, params }) => ({ items: (await listFindingNotes(actor, params.studyId)).map(dto) }));

export const POST = api<Params>(
  async ({ req, actor, params }) => {
    const input = await parseBody(req, findingNoteSchema);
    return { items: (await addFindingNote(actor, params.studyId, input)).map(dto) };
  },
  { status: 201 },
);
