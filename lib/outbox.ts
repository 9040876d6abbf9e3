import 'server-only';
import { readdir, readFile } from 'node:fs/promises';
import path from 'node:path';

/**
 * Messages caught by the local mail sink (scripts/mail-sink.mjs), one JSON file each in
 * OUTBOX_DIR. Only development and test servers set OUTBOX_DIR; without it there is no outbox.
 */
export interface OutboxMessage {
  id: string;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html?: string;
}

export function outboxDir(): string | undefined {
  // Served only when mail goes to a sink on this machine, so a misconfigured deployment that
  // sends real mail never exposes it here.
  const local = ['127.0.0.1', 'localhost', '::1'].includes(process.env.SMTP_HOST ?? '');
  return local ? process.env.OUTBOX_DIR || undefined : undefined;
}

export async function readOutbox(limit = 100): Promise<OutboxMessage[]> {
  const dir = outboxDir();
  if (!dir) return [];
  let files: string[];
  try {
    files = (await readdir(dir)).filter((f) => f.endsWith('.json'));
  } catch {
    return [];
  }
  files.sort().reverse();
  const out: OutboxMessage[] = [];
  for (const f of files.slice(0, limit)) {
    try {
      out.push(JSON.parse(await readFile(path.join(dir, f), 'utf8')) as OutboxMessage);
    } catch {
      // A file being written is skipped; the sink writes to a temporary name first.
    }
  }
  return out;
}
