/**
 * The Unitwise web server: Next's request handler behind a Node HTTP server of our own.
 * `npm start` runs it beside its PostgreSQL and mail sink, `npm run serve` runs it in a deployment
 * (after `npm run build`), and the end-to-end tests run it on port 3100.
 *
 *   node --import tsx scripts/serve.ts [--dev] [--port 3000] [--host 127.0.0.1]
 *
 * (--port and --host win over PORT and LISTEN_HOST.) Why not `next start`: at the HTTP level a
 * Next app cannot decide
 *  - the status of a page whose render failed because PostgreSQL is unreachable: a render can
 *    only choose 404/403/401 or a redirect, so Next answers 500. instrumentation.ts reports such a
 *    request by its id (set here, replacing anything a client sent) and this server turns the 500
 *    into 503 with Retry-After, the same answer the API gives;
 *  - the headers of answers that Next or Node write on their own (a request Node cannot parse, a
 *    header block over Node's 16 KB limit, Next's last-resort "Internal Server Error"): every
 *    answer starts with the security headers of lib/http/edge.mjs, and a request that never
 *    reaches Next is answered here in the app's shape.
 * Where it listens is checked with the rest of the configuration (lib/config.ts) before Next
 * loads: loopback unless LISTEN_HOST opens it.
 *
 * SIGTERM or SIGINT: stop accepting connections, let the requests in progress finish (up to 10 s),
 * then exit.
 */
import { randomUUID } from 'node:crypto';
import http, { STATUS_CODES, type IncomingMessage, type ServerResponse } from 'node:http';
import path from 'node:path';
import type { Duplex } from 'node:stream';
import { fileURLToPath } from 'node:url';
import { ConfigError, parseConfig } from '@/lib/config';
import { REQUEST_ID_HEADER, SECURITY_HEADERS, UNAVAILABLE_REQUESTS } from '@/lib/http/edge.mjs';
import { logger } from '@/lib/log';

const log = logger('web');
const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const RETRY_AFTER_SECONDS = 5;
/** For the few answers written here: they load nothing and may not be framed. */
const OWN_ANSWER_CSP = ['Content-Security-Policy', "default-src 'none'; frame-ancestors 'none'"] as const;

function flag(name: string): string | undefined {
  const i = process.argv.indexOf(`--${name}`);
  return i > 0 ? process.argv[i + 1] : undefined;
}

/**
 * Request id → time, for the renders that found the database unreachable (filled by
 * instrumentation.ts). An id is taken when its status line is written; one reported after that
 * (an error inside an already streaming page) is dropped after a minute.
 */
const unavailable = new Map<string, number>();
(globalThis as Record<symbol, unknown>)[UNAVAILABLE_REQUESTS] = unavailable;
setInterval(() => {
  const old = Date.now() - 60_000;
  for (const [id, at] of unavailable) if (at < old) unavailable.delete(id);
}, 60_000).unref();

/** Gives the request its id and turns a 5xx of a render without database into a 503. */
function track(req: IncomingMessage, res: ServerResponse): void {
  const id = randomUUID();
  req.headers[REQUEST_ID_HEADER] = id;
  const writeHead = res.writeHead;
  res.writeHead = function (this: ServerResponse, status: number, ...rest: unknown[]) {
    if (unavailable.delete(id) && status >= 500) {
      status = 503;
      if (typeof rest[0] === 'string') rest[0] = STATUS_CODES[503];
      this.setHeader('Retry-After', String(RETRY_AFTER_SECONDS));
    }
    return (writeHead as (...args: unknown[]) => ServerResponse).call(this, status, ...rest);
  } as ServerResponse['writeHead'];
}

/** An answer written without Next: the API's JSON error under /api, a short page otherwise. */
function problemBody(status: number, api: boolean): { type: string; body: string } {
  const message =
    status === 431
      ? 'The request headers are too large. Clear this site’s cookies and try again.'
      : status === 503
        ? 'The database is not reachable right now. Try again in a moment.'
        : status >= 500
          ? 'Something went wrong on our side. The error has been logged.'
          : 'The request could not be read.';
  if (api) {
    const code = status === 503 ? 'unavailable' : status >= 500 ? 'internal' : 'bad_request';
    return { type: 'application/json', body: JSON.stringify({ error: { code, message } }) };
  }
  const html = `<!DOCTYPE html><html lang="en"><head><meta charset="utf-8"><title>Unitwise</title></head><body><main><h1>${STATUS_CODES[status]}</h1><p>${message}</p><p><a href="/">Unitwise</a></p></main></body></html>`;
  return { type: 'text/html; charset=utf-8', body: html };
}

/** Node could not parse the request (bad syntax, headers over its limit): it never reaches Next. */
function answerClientError(err: NodeJS.ErrnoException & { rawPacket?: Buffer }, socket: Duplex): void {
  if (err.code === 'ECONNRESET' || !socket.writable) {
    socket.destroy();
    return;
  }
  const status = err.code === 'HPE_HEADER_OVERFLOW' ? 431 : 400;
  const api = /^[A-Z]+ \/api[/?\s]/.test(err.rawPacket?.subarray(0, 64).toString('latin1') ?? '');
  const { type, body } = problemBody(status, api);
  const headers = [...SECURITY_HEADERS, OWN_ANSWER_CSP, ['Content-Type', type], ['Content-Length', String(Buffer.byteLength(body))], ['Connection', 'close']];
  socket.end(`HTTP/1.1 ${status} ${STATUS_CODES[status]}\r\n${headers.map(([k, v]) => `${k}: ${v}`).join('\r\n')}\r\n\r\n${body}`);
}

async function main(): Promise<void> {
  const dev = process.argv.includes('--dev');
  (process.env as Record<string, string | undefined>).NODE_ENV ??= dev ? 'development' : 'production';
  if (flag('port')) process.env.PORT = flag('port');
  if (flag('host')) process.env.LISTEN_HOST = flag('host');
  const config = parseConfig(process.env, 'web');
  const { LISTEN_HOST: host, PORT: port } = config;

  const server = http.createServer();
  const { default: createNext } = (await import('next')) as unknown as { default: typeof import('next').default };
  const app = createNext({ dev, dir: root, hostname: host, port, httpServer: server });
  const handle = app.getRequestHandler();
  await app.prepare();

  server.on('request', (req: IncomingMessage, res: ServerResponse) => {
    for (const [name, value] of SECURITY_HEADERS) res.setHeader(name, value);
    track(req, res);
    handle(req, res).catch((err: unknown) => {
      log.error(`request ${req.method} ${req.url} failed`, err);
      if (res.headersSent) return void res.destroy();
      const { type, body } = problemBody(500, req.url?.startsWith('/api') ?? false);
      res.writeHead(500, { 'Content-Type': type, [OWN_ANSWER_CSP[0]]: OWN_ANSWER_CSP[1] }).end(body);
    });
  });
  server.on('clientError', answerClientError);

  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, host, () => resolve());
  });
  log.info(`listening on http://${host.includes(':') ? `[${host}]` : host}:${port}${dev ? ' (development)' : ''}`);

  let stopping = false;
  const stop = (signal: string) => {
    if (stopping) return;
    stopping = true;
    log.info(`${signal}: finishing the requests in progress`);
    setTimeout(() => process.exit(0), 10_000).unref();
    server.close(() => void app.close().finally(() => process.exit(0)));
    server.closeIdleConnections();
  };
  for (const signal of ['SIGTERM', 'SIGINT', 'SIGHUP'] as const) process.on(signal, () => stop(signal));
}

main().catch((err: unknown) => {
  if (err instanceof ConfigError) log.error(`cannot start. ${err.message}`);
  else log.error('cannot start', err);
  process.exit(1);
});
