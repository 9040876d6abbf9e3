import 'server-only';
import { cachedReader, webConfigSchema, type Config } from './config';

/**
 * The web server's configuration (lib/config.ts holds the one schema). Validated at start-up by
 * instrumentation.ts; this accessor re-reads it when a variable changes, so tests can switch
 * settings between cases. Client code never imports this file: the app has no browser variables.
 */
export type ServerEnv = Config;

export const env: () => ServerEnv = cachedReader(webConfigSchema);
