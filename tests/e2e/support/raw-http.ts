/**
 * Requests exactly as written, for the specs about the HTTP edge: the path is sent byte for byte
 * (a browser or fetch would normalise a broken %-encoding), with the headers given and nothing else.
 */
import http from 'node:http';

export interface RawResponse {
  status: number;
  headers: http.IncomingHttpHeaders;
  body: string;
}

export interface RawRequest {
  method?: string;
  headers?: Record<string, string>;
  body?: string;
  host?: string;
  port?: number;
}

export function raw(path: string, { method = 'GET', headers = {}, body, host = '127.0.0.1', port = 3100 }: RawRequest = {}): Promise<RawResponse> {
  return new Promise((resolve, reject) => {
    const req = http.request({ host, port, method, path, headers: { host: `localhost:${port}`, connection: 'close', ...headers }, timeout: 30_000 }, (res) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body: Buffer.concat(chunks).toString('utf8') }));
      res.on('error', reject);
    });
    req.on('error', reject);
    req.on('timeout', () => req.destroy(new Error(`no answer to ${method} ${path.slice(0, 80)} within 30 s`)));
    req.end(body);
  });
}

/** The nonce of a Content-Security-Policy header, or undefined. */
export function cspNonce(csp: string | string[] | undefined): string | undefined {
  return /'nonce-([A-Za-z0-9+/=]+)'/.exec(String(csp ?? ''))?.[1];
}
