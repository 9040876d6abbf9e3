/**
 * One log line format for the web server, the worker and the scripts that import app code:
 * `2026-12-03T08:01:02.345Z INFO  [scope] message key=value`. Timestamps are UTC (ISO 8601) so
 * that lines from several processes and machines sort together. Errors go to stderr, the rest to
 * stdout. No dependency: the process manager or the platform collects the streams.
 */
export type Level = 'debug' | 'info' | 'warn' | 'error';

const ORDER: Record<Level, number> = { debug: 10, info: 20, warn: 30, error: 40 };

function threshold(): number {
  const wanted = (process.env.LOG_LEVEL ?? 'info').toLowerCase() as Level;
  return ORDER[wanted] ?? ORDER.info;
}

function detail(value: unknown): string {
  if (value instanceof Error) return value.stack ?? `${value.name}: ${value.message}`;
  if (typeof value === 'string') return value;
  try {
    return JSON.stringify(value);
  } catch {
    return String(value);
  }
}

export interface Logger {
  debug(message: string, extra?: unknown): void;
  info(message: string, extra?: unknown): void;
  warn(message: string, extra?: unknown): void;
  error(message: string, extra?: unknown): void;
}

/** A logger whose lines carry `[scope]`, e.g. `logger('worker 1234')`. */
export function logger(scope: string): Logger {
  const write = (level: Level, message: string, extra?: unknown) => {
    if (ORDER[level] < threshold()) return;
    const line = `${new Date().toISOString()} ${level.toUpperCase().padEnd(5)} [${scope}] ${message}${extra === undefined ? '' : ` ${detail(extra)}`}`;
    (level === 'error' || level === 'warn' ? console.error : console.log)(line);
  };
  return {
    debug: (m, e) => write('debug', m, e),
    info: (m, e) => write('info', m, e),
    warn: (m, e) => write('warn', m, e),
    error: (m, e) => write('error', m, e),
  };
}
