import { z } from 'zod';
import { text } from '@/lib/text-schema';

/** What a version is called ("sent to the funder", "ethics board v2"); null clears the name. */
const versionName = text('Name', 1, 120).meta({ example: 'Sent to the funder' });

export const versionNameSchema = z.object({ name: versionName.nullable() }).meta({ id: 'VersionName' });
export type VersionNameInput = z.infer<typeof versionNameSchema>;

const versionNumber = z.number({ error: 'Choose a version.' }).int().min(1, 'Choose a version.');

export const versionCompareQuerySchema = z
  .object({
    from: z.coerce.number({ error: 'Choose the version to compare from.' }).int().min(1, 'Choose the version to compare from.'),
    to: z.coerce.number({ error: 'Choose the version to compare with.' }).int().min(1, 'Choose the version to compare with.'),
  })
  .meta({ id: 'VersionCompareQuery' });
export type VersionCompareQuery = z.infer<typeof versionCompareQuerySchema>;

export const signoffCreateSchema = z
  .object({
    version: versionNumber,
    /** A version is signed off by name: required when the version has none yet. */
    name: versionName.optional(),
    statement: text('What you reviewed', 1, 4000).meta({ example: 'Reviewed the design, the checks and the Plan; the analysis accounts for trays.' }),
    conditions: text('Conditions', 0, 2000).optional(),
  })
  .meta({ id: 'SignoffCreate' });
export type SignoffCreateInput = z.infer<typeof signoffCreateSchema>;

export const signoffWithdrawSchema = z.object({ reason: text('Reason', 1, 2000) }).meta({ id: 'SignoffWithdraw' });
export type SignoffWithdrawInput = z.infer<typeof signoffWithdrawSchema>;
