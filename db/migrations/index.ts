/**
 * Explicit index of migrations, in order. The bundler cannot read a folder at run time, so
 * every new migration file is added here by hand (DEVELOPERS.md, "Adding a migration").
 */
import type { Migration } from 'kysely';
import * as foundation from './20261201T100000_foundation';
import * as designChecks from './20261201T230000_design_checks';
import * as simulations from './20261202T033500_simulations';
import * as planResults from './20261202T034000_plan_results';
import * as mailQueue from './20261203T100000_mail_queue';
import * as pacedRateLimits from './20261203T100100_paced_rate_limits';
import * as idempotencyKeys from './20261203T110000_idempotency_keys';
import * as fairQueue from './20261203T120000_fair_queue';
import * as versionsAndSignoffs from './20261204T100000_versions_and_signoffs';
import * as reviewThreads from './20261204T110000_review_threads';
import * as notifications from './20261204T120000_notifications';

export const migrations: Record<string, Migration> = {
  '20261201T100000_foundation': foundation,
  '20261201T230000_design_checks': designChecks,
  '20261202T033500_simulations': simulations,
  '20261202T034000_plan_results': planResults,
  '20261203T100000_mail_queue': mailQueue,
  '20261203T100100_paced_rate_limits': pacedRateLimits,
  '20261203T110000_idempotency_keys': idempotencyKeys,
  '20261203T120000_fair_queue': fairQueue,
  '20261204T100000_versions_and_signoffs': versionsAndSignoffs,
  '20261204T110000_review_threads': reviewThreads,
  '20261204T120000_notifications': notifications,
};
