/**
 * Notifications by e-mail and the activity log (issue 12, points 6 and 7): the settings page
 * from the header; a mention reaches the outbox with a one-click unsubscribe link and headers;
 * the link works signed out and turns that kind off; the activity page filters through its
 * address and downloads CSV. axe on each new screen.
 *
 * The events that cause notifications (comments, suggestions, sign-offs) are built in other
 * branches; here a mention is caused through the real notify() from outside the browser
 * (support/notify.ts), and the web server's mail sender delivers it.
 */
import fs from 'node:fs/promises';
import { expect, test, type BrowserContext, type Page } from '@playwright/test';
import { ActivityPage, NotificationSettingsPage, UnsubscribePage } from './pages/notification-pages';
import { OutboxHelper, OutboxPage, linksIn } from './pages/outbox';
import { WorkspacePage } from './pages/workspace-page';
import { expectNoSeriousA11yViolations } from './support/axe';
import { atBothWidths } from './support/widths';
import { registerAndSignIn } from './support/flows';
import { notifyFromOutside } from './support/notify';
import { APP_ORIGIN, distinctClientHeaders, STRONG_PASSWORD, uniqueEmail } from './support/test-data';

const clientHeaders = distinctClientHeaders();
test.use({ extraHTTPHeaders: clientHeaders });

test.describe.configure({ mode: 'serial' });

let context: BrowserContext;
let page: Page;
let studyId = '';
const owner = { name: 'Priya Nair', email: uniqueEmail('notices'), password: STRONG_PASSWORD };
const TITLE = 'Classroom reading support';

test.beforeAll(async ({ browser }) => {
  test.setTimeout(60_000);
  context = await browser.newContext({ baseURL: APP_ORIGIN, extraHTTPHeaders: clientHeaders });
  page = await context.newPage();
  await registerAndSignIn(page, owner);
  studyId = await new WorkspacePage(page).createStudyNamed(TITLE);
});

test.afterAll(async () => {
  await context?.close();
});

test('notification settings: reached from the header, saved, kept', async () => {
  const settings = new NotificationSettingsPage(page);
  await settings.openFromHeader();
  await expect(settings.choice('Mentions', 'At once')).toBeChecked();
  await expect(settings.choice('Replies in your threads', 'Daily digest')).toBeChecked();
  await atBothWidths(page, 'notification-settings');
  await settings.choice('Withdrawn sign-offs', 'Daily digest').check();
  await settings.save.click();
  await expect(settings.status).toContainText('Saved.');
  await page.reload();
  await expect(settings.choice('Withdrawn sign-offs', 'Daily digest')).toBeChecked();
});

test('a mention reaches the outbox; its link unsubscribes without signing in', async ({ browser }) => {
  const since = new Date();
  notifyFromOutside({
    to: owner.email,
    studyId,
    kind: 'mention',
    subject: `Dr Ama Owusu mentioned you on ${TITLE}`,
    text: 'Dr Ama Owusu wrote on the unit-of-analysis finding:\n“@Priya is the ICC of 0.2 from the pilot?”',
    path: `/studies/${studyId}/review`,
    dedupeKey: `e2e:${Date.now()}:mention`,
  });
  const outbox = new OutboxHelper();
  const mail = await outbox.waitForMail({ to: owner.email, subject: 'mentioned you on', since, timeoutMs: 20_000 });
  expect(mail.text).toContain(`Study: ${TITLE}`);
  expect(mail.text).toContain('because someone mentioned you in a comment');
  const unsubscribe = linksIn(mail.text).find((l) => l.includes('/unsubscribe/'));
  expect(unsubscribe).toMatch(/^http:\/\/localhost:3100\/unsubscribe\//);
  expect(mail.headers?.['List-Unsubscribe']).toMatch(/^<http:\/\/localhost:3100\/api\/v1\/unsubscribe\/.+>$/);
  expect(mail.headers?.['List-Unsubscribe-Post']).toBe('List-Unsubscribe=One-Click');

  // The development outbox shows it, headers included.
  const outboxPage = new OutboxPage(await context.newPage());
  await outboxPage.goto();
  await outboxPage.filterByRecipient(owner.email);
  await expect(outboxPage.message(mail.subject)).toContainText('List-Unsubscribe-Post');
  await outboxPage.page.close();

  // Signed out, in another browser.
  const guest = await browser.newContext({ baseURL: APP_ORIGIN, extraHTTPHeaders: clientHeaders });
  try {
    const guestPage = await guest.newPage();
    const unsubscribePage = new UnsubscribePage(guestPage);
    await guestPage.goto(unsubscribe!);
    await expect(unsubscribePage.heading('mentions of you')).toBeVisible();
    await expect(guestPage.getByText(owner.email, { exact: true })).toBeVisible();
    await expectNoSeriousA11yViolations(guestPage, 'Unsubscribe page');
    await unsubscribePage.stop.click();
    await expect(guestPage.getByRole('status')).toContainText('will no longer get e-mails about mentions of you');
    await expectNoSeriousA11yViolations(guestPage, 'Unsubscribe page, done');

    // A link altered by one character is refused.
    await guestPage.goto(unsubscribe!.replace(/.$/, (c) => (c === 'A' ? 'B' : 'A')));
    await expect(guestPage.getByRole('heading', { level: 1, name: 'This link is not valid' })).toBeVisible();
  } finally {
    await guest.close();
  }

  const settings = new NotificationSettingsPage(page);
  await page.goto('/settings/notifications');
  await expect(settings.choice('Mentions', 'None')).toBeChecked();
  await expect(settings.choice('Sign-offs', 'At once')).toBeChecked();
});

test('activity: filters in the address, words for each event, CSV download', async () => {
  const activity = new ActivityPage(page);
  await activity.goto(studyId);
  await expect(activity.events).toContainText('Priya Nair created the study');
  await atBothWidths(page, 'activity-page');

  await activity.kind.selectOption({ label: 'Members and invitations' });
  await activity.show.click();
  await page.waitForURL(/[?&]kind=members/);
  await expect(page.getByText('Nothing matches these filters.')).toBeVisible();
  await expectNoSeriousA11yViolations(page, 'Activity page, filtered');

  await activity.kind.selectOption({ label: 'Edits and versions' });
  await activity.show.click();
  await page.waitForURL(/[?&]kind=edits/);
  const [download] = await Promise.all([page.waitForEvent('download'), activity.download.click()]);
  expect(download.suggestedFilename()).toMatch(/^classroom-reading-support-activity-\d{4}-\d{2}-\d{2}\.csv$/);
  const csv = await fs.readFile((await download.path())!, 'utf8');
  const lines = csv.split('\r\n');
  expect(lines[0]).toBe('Time (UTC),Person,E-mail,What happened,Action,Details');
  expect(lines[1]).toContain('Priya Nair created the study');

  await activity.goto(studyId);
  await expect(activity.events).toContainText('Priya Nair downloaded the activity log (1 entry)');
});
