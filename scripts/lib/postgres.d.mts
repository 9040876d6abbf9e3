/** Types of postgres.mjs, for the TypeScript tests that start a throwaway server with it. */
export interface PostgresHandle {
  /** true when this call started the server (then stop() stops it). */
  startedByUs: boolean;
  url: string;
  /** `pg_ctl stop -m fast`, synchronously; true when it stopped. */
  stop(): boolean | void;
}

export function ensurePostgres(options: {
  dataDir: string;
  port: number;
  user: string;
  password: string;
  database: string;
  options?: string[];
  log?: (message: string) => void;
}): Promise<PostgresHandle>;

export function stopPostgresIn(dataDir: string, options?: { mode?: string; log?: (message: string) => void }): boolean;
