import { api } from '@/lib/api/handler';
import { cancelSimulation, getSimulation } from '@/lib/data/simulations';
import { simulationParamsSchema } from '@/lib/validation/params';

export const GET = api(async ({ actor, params }) => getSimulation(actor, params.simulationId), { params: simulationParamsSchema });

export const DELETE = api(async ({ actor, params }) => cancelSimulation(actor, params.simulationId), { params: simulationParamsSchema });
