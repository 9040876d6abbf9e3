/**
 * Development and test mail sink: a tiny SMTP server that accepts every message (and any AUTH)
 * and stores it as one JSON file in a folder, for the app's /dev/outbox page and for tests.
 *
 *   import { startMailSink } from './scripts/mail-sink.mjs';
 *   const sink = await startMailSink({ port: 2525, dir: '.data/outbox' });  // ... await sink.close();
 *
 *   node scripts/mail-sink.mjs --port 2525 --dir .data/outbox [--host 127.0.0.1]
 *
 * Each message becomes `<dir>/<time>-<random>.json`, where <time> is the ISO-8601 receive time with
 * ':' and '.' replaced by '-' (file names sort by time), holding
 *   { id, receivedAt, from, to: string[], subject, text, html, headers? }
 * `id` is the file name without `.json`; `to` lists the SMTP envelope recipients (so Bcc too);
 * `html` is null for text-only mail; `headers` holds List-Unsubscribe and List-Unsubscribe-Post when sent. The file is written under a dot-prefixed temporary name and
 * then renamed, so readers never see half a message. Listens on 127.0.0.1 only, without STARTTLS.
 */
import crypto from 'node:crypto';
import fs from 'node:fs/promises';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { simpleParser } from 'mailparser';
import { SMTPServer } from 'smtp-server';

/** @param {{ key: string, line: string }[]} lines */
function listHeaders(lines) {
  const wanted = ['list-unsubscribe', 'list-unsubscribe-post'];
  const found = lines.filter((h) => wanted.includes(h.key));
  if (!found.length) return {};
  return { headers: Object.fromEntries(found.map((h) => [h.line.slice(0, h.line.indexOf(':')), h.line.slice(h.line.indexOf(':') + 1).replace(/\r?\n[ \t]+/g, ' ').trim()])) };
}

/**
 * @param {{ port?: number, host?: string, dir: string, log?: (line: string) => void }} opts
 * @returns {Promise<{ port: number, dir: string, close: () => Promise<void> }>}
 */
export async function startMailSink({ port = 2525, host = '127.0.0.1', dir, log = console.log }) {
  dir = path.resolve(dir);
  await fs.mkdir(dir, { recursive: true });

  async function store(stream, session) {
    const mail = await simpleParser(stream);
    const receivedAt = new Date().toISOString();
    const id = `${receivedAt.replace(/[:.]/g, '-')}-${crypto.randomBytes(4).toString('hex')}`;
    const message = {
      id,
      receivedAt,
      from: mail.from?.text || session.envelope.mailFrom?.address || '',
      to: session.envelope.rcptTo.map((r) => r.address),
      subject: mail.subject ?? '',
      text: mail.text ?? '',
      html: mail.html || null,
      // The unsubscribe headers of notifications (RFC 2369, RFC 8058), as sent; absent on other mail.
      ...listHeaders(mail.headerLines),
    };
    const tmp = path.join(dir, `.${id}.tmp`);
    await fs.writeFile(tmp, JSON.stringify(message, null, 2) + '\n');
    await fs.rename(tmp, path.join(dir, `${id}.json`));
    log(`[mail] ${receivedAt} to ${message.to.join(', ')}: ${message.subject} (${id}.json)`);
  }

  const server = new SMTPServer({
    name: 'unitwise-mail-sink',
    banner: 'Unitwise development mail sink',
    authOptional: true,
    allowInsecureAuth: true,
    disabledCommands: ['STARTTLS'],
    size: 25 * 1024 * 1024,
    logger: false,
    closeTimeout: 1000, // on close, wait at most 1 s for open connections
    onAuth(auth, _session, callback) {
      callback(null, { user: auth.username || 'anonymous' });
    },
    onData(stream, session, callback) {
      store(stream, session).then(
        () => callback(),
        (err) => {
          log(`[mail] could not store a message: ${err.message}`);
          callback(err);
        },
      );
    },
  });
  await new Promise((resolve, reject) => {
    const onError = (err) => {
      reject(err.code === 'EADDRINUSE'
        ? Object.assign(new Error(`port ${port} (mail sink) is already in use by another program`), { code: 'EADDRINUSE' })
        : err);
    };
    server.once('error', onError);
    server.listen(port, host, () => {
      server.off('error', onError);
      server.on('error', (err) => log(`[mail] ${err.message}`));
      resolve();
    });
  });

  return {
    port,
    dir,
    close: () => new Promise((resolve) => server.close(() => resolve())),
  };
}

/** Standalone: node scripts/mail-sink.mjs --port 2525 --dir .data/outbox */
if (process.argv[1] && import.meta.url === pathToFileURL(path.resolve(process.argv[1])).href) {
  const arg = (name, fallback) => {
    const i = process.argv.indexOf(`--${name}`);
    return i > 0 && process.argv[i + 1] ? process.argv[i + 1] : fallback;
  };
  const port = Number(arg('port', process.env.SMTP_PORT || 2525));
  const host = arg('host', '127.0.0.1');
  const dir = arg('dir', process.env.OUTBOX_DIR || '.data/outbox');
  try {
    const sink = await startMailSink({ port, host, dir });
    console.log(`[mail] mail sink listening on ${host}:${port}, writing ${path.relative(process.cwd(), sink.dir) || '.'}`);
    const shutdown = () => sink.close().then(() => process.exit(0));
    process.once('SIGINT', shutdown);
    process.once('SIGTERM', shutdown);
  } catch (err) {
    console.error(`error: ${err.message}`);
    process.exit(1);
  }
}
