/**
 * The local mail sink's outbox: one JSON file per e-mail in OUTBOX_DIR (scripts/mail-sink.mjs),
 * read straight from disk. Also a page object for the /dev/outbox page.
 */
import fs from 'node:fs/promises';
import path from 'node:path';
import { expect, type Locator, type Page } from '@playwright/test';

export interface OutboxMail {
  id: string;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string | null;
  /** List-Unsubscribe and List-Unsubscribe-Post of a notification. */
  headers?: Record<string, string>;
}

export interface MailQuery {
  /** Recipient address (case-insensitive exact match). */
  to: string;
  /** Subject: a substring or a pattern. */
  subject: string | RegExp;
  /** Only mail received at or after this time (defaults to any time). */
  since?: Date;
  timeoutMs?: number;
}

export function linksIn(text: string): string[] {
  return text.match(/https?:\/\/[^\s<>"']+/g) ?? [];
}

export class OutboxHelper {
  readonly dir: string;

  constructor(dir = process.env.OUTBOX_DIR) {
    if (!dir) throw new Error('OUTBOX_DIR is not set: run the e2e tests through playwright.config.ts (npm test).');
    this.dir = dir;
  }

  /** Every stored mail, oldest first. */
  async all(): Promise<OutboxMail[]> {
    let files: string[];
    try {
      files = (await fs.readdir(this.dir)).filter((f) => f.endsWith('.json') && !f.startsWith('.'));
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code === 'ENOENT') return [];
      throw err;
    }
    files.sort();
    const mails: OutboxMail[] = [];
    for (const f of files) {
      try {
        mails.push(JSON.parse(await fs.readFile(path.join(this.dir, f), 'utf8')) as OutboxMail);
      } catch {
        // The sink renames complete files into place, so this is a file removed meanwhile.
      }
    }
    return mails;
  }

  async find(q: Omit<MailQuery, 'timeoutMs'>): Promise<OutboxMail[]> {
    const to = q.to.toLowerCase();
    return (await this.all()).filter(
      (m) =>
        m.to.some((r) => r.toLowerCase() === to) &&
        (typeof q.subject === 'string' ? m.subject.includes(q.subject) : q.subject.test(m.subject)) &&
        (!q.since || Date.parse(m.receivedAt) >= q.since.getTime()),
    );
  }

  /** Polls for the newest mail matching the query, for up to `timeoutMs` (10 s). */
  async waitForMail(q: MailQuery): Promise<OutboxMail> {
    const deadline = Date.now() + (q.timeoutMs ?? 10_000);
    for (;;) {
      const found = await this.find(q);
      const newest = found[found.length - 1];
      if (newest) return newest;
      if (Date.now() > deadline) {
        const seen = (await this.all()).map((m) => `  ${m.receivedAt} to ${m.to.join(', ')}: ${m.subject}`).join('\n');
        throw new Error(`No mail to ${q.to} with subject ${String(q.subject)} within ${q.timeoutMs ?? 10_000} ms. Outbox:\n${seen || '  (empty)'}`);
      }
      await new Promise((r) => setTimeout(r, 200));
    }
  }

  /** The newest matching mail and the first link in its text. */
  async waitForLink(q: MailQuery): Promise<{ mail: OutboxMail; link: string }> {
    const mail = await this.waitForMail(q);
    const link = linksIn(mail.text)[0];
    if (!link) throw new Error(`Mail "${mail.subject}" to ${q.to} has no link:\n${mail.text}`);
    return { mail, link };
  }
}

/** The development outbox page, /dev/outbox. */
export class OutboxPage {
  readonly heading: Locator;
  readonly recipientFilter: Locator;
  readonly filterButton: Locator;

  constructor(readonly page: Page) {
    this.heading = page.getByRole('heading', { level: 1, name: 'Outbox' });
    this.recipientFilter = page.getByLabel('Recipient contains');
    this.filterButton = page.getByRole('button', { name: 'Filter' });
  }

  /**
   * The page answers only requests made on the server's machine, not through a proxy. Specs
   * present themselves as distinct clients behind a proxy (X-Forwarded-For, see test-data.ts), so
   * the outbox's own requests go without that header, as the developer's browser would send them.
   */
  async goto(): Promise<void> {
    await this.page.route('**/dev/outbox**', async (route) => {
      const { 'x-forwarded-for': _client, ...headers } = route.request().headers();
      await route.continue({ headers });
    });
    await this.page.goto('/dev/outbox');
    await expect(this.heading).toBeVisible();
  }

  async filterByRecipient(text: string): Promise<void> {
    await this.recipientFilter.fill(text);
    await Promise.all([this.page.waitForURL(/\/dev\/outbox\?to=/), this.filterButton.click()]);
  }

  message(subject: string): Locator {
    return this.page.getByRole('article', { name: subject });
  }
}
