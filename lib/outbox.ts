import 'server-only';
import { readdir, readFile } from 'node:fs/promises';
import { isIP } from 'node:net';
import path from 'node:path';
import { env } from '@/lib/env';
import { PEER_ADDRESS_HEADER } from '@/lib/http/edge.mjs';

/**
 * Messages caught by the local mail sink (scripts/mail-sink.mjs), one JSON file each in
 * OUTBOX_DIR, shown at /dev/outbox. The page holds every password-reset and sign-in link the app
 * sends, so it is a way into every account: it exists only on a developer's machine, and only for
 * requests made on that machine.
 */
export interface OutboxMessage {
  id: string;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html?: string;
  /** List-Unsubscribe and List-Unsubscribe-Post, when the message has them. */
  headers?: Record<string, string>;
}

const LOOPBACK_NAMES = new Set(['localhost', '127.0.0.1', '::1', '[::1]']);

function isLoopbackAddress(address: string): boolean {
  const a = address.trim().toLowerCase().replace(/^::ffff:(?=\d+\.)/, '');
  if (isIP(a) === 4) return a.startsWith('127.');
  return a === '::1';
}

/**
 * The outbox folder while the local sink is in use, else undefined. Three conditions, each set by
 * `npm start` and by none of a deployment's settings: DEV_OUTBOX (npm start passes it only while
 * the server listens on loopback), OUTBOX_DIR, and mail going to an SMTP server on this machine
 * (so a deployment that sends real mail never lists it here).
 */
export function outboxDir(): string | undefined {
  const e = env();
  if (!e.DEV_OUTBOX || !e.OUTBOX_DIR) return undefined;
  return LOOPBACK_NAMES.has(e.SMTP_HOST) ? e.OUTBOX_DIR : undefined;
}

/**
 * True when a request comes from this machine. Next gives a page no socket, only headers: the
 * connection's peer is in the header that scripts/serve.ts sets (replacing any value a client
 * sent), and it must be a loopback address. Next fills X-Forwarded-For with the peer's address
 * when the client sent none and keeps a client's value otherwise, so that header must hold that
 * one loopback address too. The request must also name a loopback host (which defeats DNS
 * rebinding) and carry no other sign of a proxy in between. DEV_OUTBOX is moreover only given to
 * a server that listens on loopback, where every peer is on this machine.
 */
export function isLocalRequest(headers: Headers): boolean {
  const peer = headers.get(PEER_ADDRESS_HEADER);
  if (!peer || !isLoopbackAddress(peer)) return false;
  const host = headers.get('host')?.toLowerCase().replace(/:\d+$/, '');
  if (!host || !LOOPBACK_NAMES.has(host)) return false;
  const forwardedHost = headers.get('x-forwarded-host');
  if (forwardedHost && forwardedHost.toLowerCase() !== headers.get('host')?.toLowerCase()) return false;
  if (headers.has('forwarded') || headers.has('x-real-ip')) return false;
  const peers = (headers.get('x-forwarded-for') ?? '').split(',').filter((p) => p.trim());
  return peers.length === 1 && isLoopbackAddress(peers[0]!);
}

export async function readOutbox(limit = 100): Promise<OutboxMessage[]> {
  const dir = outboxDir();
  if (!dir) return [];
  let files: string[];
  try {
    files = (await readdir(/* turbopackIgnore: true */ dir)).filter((f) => f.endsWith('.json'));
  } catch {
    return [];
  }
  files.sort().reverse();
  const out: OutboxMessage[] = [];
  for (const f of files.slice(0, limit)) {
    try {
      out.push(JSON.parse(await readFile(path.join(/* turbopackIgnore: true */ dir, f), 'utf8')) as OutboxMessage);
    } catch {
      // A file being written is skipped; the sink writes to a temporary name first.
    }
  }
  return out;
}
