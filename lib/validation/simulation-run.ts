/**
 * Starting a stress-test run (POST /api/v1/simulations). Two forms:
 *   { "spec": {…} }                               a compact specification; the run is yours alone
 *   { "studyId", "revision"?, "spec"?, "replicates"?, "seed"? }
 *                                                 a run on a study: from the specification sent, or
 *                                                 else from the design of the revision (the newest
 *                                                 when left out), with replicates and seed overriding
 *                                                 the design's defaults
 * The specification itself is `simulationSpecSchema` (lib/sim/spec.ts).
 */
import { fieldLabel } from '@/lib/field-messages';
import { z } from 'zod';
import { simulationSpecSchema } from '@/lib/sim/spec';

export const simulationRunSchema = z
  .object({
    studyId: z.uuid({ error: 'Choose a study from the list.' }).optional(),
    revision: z.number({ error: 'revision must be a number.' }).int('revision must be a whole number.').min(1, 'revision is at least 1.').optional(),
    spec: simulationSpecSchema.optional(),
    replicates: simulationSpecSchema.shape.replicates.unwrap().optional(),
    seed: simulationSpecSchema.shape.seed.unwrap().optional(),
  })
  .strict()
  .superRefine((v, ctx) => {
    if (v.studyId === undefined && v.spec === undefined) {
      ctx.addIssue({ code: 'custom', path: ['spec'], message: 'Send a stress-test specification, or the study whose design to use.' });
    }
    if (v.studyId === undefined && v.revision !== undefined) {
      ctx.addIssue({ code: 'custom', path: ['revision'], message: 'A revision applies to a run on a study: send the study too.' });
    }
    for (const key of ['replicates', 'seed'] as const) {
      if (v[key] === undefined) continue;
      if (v.spec !== undefined) ctx.addIssue({ code: 'custom', path: [key], message: `With a specification, give the ${fieldLabel(key)} inside the specification.` });
      else if (v.studyId === undefined) ctx.addIssue({ code: 'custom', path: [key], message: `The ${fieldLabel(key)} applies to a run on a study here: send the study too.` });
    }
  })
  .meta({ id: 'SimulationRun', description: 'Either spec, or studyId with an optional revision, spec, replicates and seed.' });

export type SimulationRunInput = z.infer<typeof simulationRunSchema>;

/** The query of GET /api/v1/studies/{studyId}/simulations/spec: which revision's design to use. */
export const simulationSpecQuerySchema = z
  .object({
    revision: z.coerce.number({ error: 'revision must be a number.' }).int('revision must be a whole number.').min(1, 'revision is at least 1.').optional(),
  })
  .meta({ id: 'SimulationSpecQuery' });
