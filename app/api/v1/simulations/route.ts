import { api, parseBody } from '@/lib/api/handler';
import { createSimulation } from '@/lib/data/simulations';
import { simulationRunSchema } from '@/lib/validation/simulation-run';

export const POST = api(
  async ({ req, actor }) => {
    const input = await parseBody(req, simulationRunSchema);
    return createSimulation(actor, input);
  },
  { status: 202 },
);
