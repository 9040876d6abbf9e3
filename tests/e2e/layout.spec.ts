/**
 * Layout at a phone (390 px), a small laptop (1024 px) and a common laptop (1366 px): every step
 * of the design wizard, every tab of a study and the workspace's studies table. Layout
 * assertions rather than screenshots compared by pixels (fonts and anti-aliasing differ between
 * machines): the page never scrolls sideways, nothing sticks out of its card or scrolls inside it,
 * every label shows its text in full, and every field is wide enough to type in (a wide data table
 * may scroll in its own box, except the studies table, which must fit). No page shows an
 * internal id. Screenshots are written to .data/test/layout/ for a person to look at.
 *
 * The design is the demo's classroom design (four occasions), loaded through the design API.
 */
import path from 'node:path';
import { expect, test, type Page } from '@playwright/test';
import { CLASSROOM_DESIGN } from '../../db/demo/designs';
import { DESIGN_STEPS } from '../../lib/design/schema';
import { STUDY_TABS } from '../../lib/study-tabs';
import { WorkspacePage } from './pages/workspace-page';
import { expectNoSeriousA11yViolations } from './support/axe';
import { registerAndSignIn } from './support/flows';
import { distinctClientHeaders, STRONG_PASSWORD, uniqueEmail } from './support/test-data';

test.use({ extraHTTPHeaders: distinctClientHeaders() });

const WIDTHS = [390, 1024, 1366] as const;
const SHOTS = path.resolve(__dirname, '../../.data/test/layout');
/** Ids of the engine and the design model that must never be read on a page. */
const INTERNAL_IDS = /\b(?:kenward-roger|between-within|ols-hc3|log-ols|glm-nb|glmm|cluster-means|targetPower|costPerUnit|costPerCluster|nPerGroup|clustersPerArm|unitsPerArm)\b/;

/** What is wrong with the layout of the page now, in words; empty when nothing is. */
async function layoutProblems(page: Page): Promise<string[]> {
  return page.evaluate(() => {
    const problems: string[] = [];
    const doc = document.documentElement;
    if (doc.scrollWidth > doc.clientWidth + 1) problems.push(`the page scrolls sideways: ${doc.scrollWidth}px of content in a ${doc.clientWidth}px window`);
    const main = document.querySelector('main') ?? document.body;
    const hidden = (el: Element) => {
      if (el.closest('.sr-only, [hidden], details:not([open]) > :not(summary), svg, [role="img"], .recharts-wrapper')) return true;
      const r = el.getBoundingClientRect();
      const s = getComputedStyle(el);
      return r.width === 0 || r.height === 0 || s.visibility === 'hidden' || s.display === 'none';
    };
    /** A wide data table in its own sideways-scrolling box (the Plan's grid of ICCs × cluster sizes on a phone) is allowed. */
    const scrollsOnPurpose = (el: Element) => ['auto', 'scroll'].includes(getComputedStyle(el).overflowX) && el.querySelector('table') !== null;
    const inScrollBox = (el: Element, within: Element) => {
      for (let a = el.parentElement; a && a !== within; a = a.parentElement) if (scrollsOnPurpose(a)) return true;
      return false;
    };
    const describe = (el: Element) => {
      const text = (el.textContent ?? '').replace(/\s+/g, ' ').trim().slice(0, 50) || el.getAttribute('name') || el.getAttribute('aria-label') || '';
      return `${el.tagName.toLowerCase()} "${text}"`;
    };

    // Nothing scrolls or clips sideways inside a box.
    for (const el of main.querySelectorAll<HTMLElement>('*')) {
      if (hidden(el) || el.matches('input, select, textarea, pre, code') || scrollsOnPurpose(el)) continue;
      const s = getComputedStyle(el);
      if (['auto', 'scroll', 'hidden', 'clip'].includes(s.overflowX) && el.scrollWidth > el.clientWidth + 1) {
        problems.push(`${describe(el)} hides ${el.scrollWidth - el.clientWidth}px of its content sideways`);
      }
    }

    // Nothing sticks out of its card (a box with a border and rounded corners).
    const cards = [...main.querySelectorAll<HTMLElement>('*')].filter((el) => {
      if (hidden(el) || el.matches('input, select, textarea, button, a, span, code')) return false;
      const s = getComputedStyle(el);
      return parseFloat(s.borderTopWidth) > 0 && parseFloat(s.borderLeftWidth) > 0 && s.borderTopLeftRadius !== '0px';
    });
    for (const card of cards) {
      const c = card.getBoundingClientRect();
      for (const el of card.querySelectorAll('label, legend, input, select, textarea, button, a, th, td, p, h2, h3, dt, dd, li')) {
        if (hidden(el) || inScrollBox(el, card)) continue;
        const r = el.getBoundingClientRect();
        if (r.left < c.left - 1 || r.right > c.right + 1) problems.push(`${describe(el)} sticks out of its card ${describe(card).slice(0, 40)} by ${Math.round(Math.max(c.left - r.left, r.right - c.right))}px`);
      }
    }

    // Every label and heading shows its text in full, and every field is wide enough to type in.
    for (const el of main.querySelectorAll<HTMLElement>('label, legend, th, button, h1, h2, h3, dt')) {
      if (hidden(el)) continue;
      if (el.scrollWidth > el.clientWidth + 1) problems.push(`${describe(el)} is cut: ${el.scrollWidth}px of text in ${el.clientWidth}px`);
    }
    for (const el of main.querySelectorAll<HTMLElement>('input:not([type=checkbox]):not([type=radio]):not([type=hidden]), select, textarea')) {
      if (hidden(el)) continue;
      const width = el.getBoundingClientRect().width;
      if (width < 64) problems.push(`the field ${el.getAttribute('name') ?? el.id} is only ${Math.round(width)}px wide`);
    }
    return [...new Set(problems)];
  });
}

async function expectGoodLayout(page: Page, what: string, width: number): Promise<void> {
  await page.screenshot({ path: path.join(SHOTS, `${what.replace(/[^a-z0-9]+/gi, '-').toLowerCase()}-${width}.png`), fullPage: true });
  expect.soft(await layoutProblems(page), `${what} at ${width}px`).toEqual([]);
  const text = await page.locator('main').innerText();
  expect.soft(text.match(INTERNAL_IDS)?.[0], `${what} at ${width}px shows an internal id`).toBeUndefined();
}

test('every wizard step, study tab and the studies table fit at 390, 1024 and 1366 px', async ({ page }) => {
  test.setTimeout(240_000);
  const workspaceId = await registerAndSignIn(page, { name: 'Lena Layout', email: uniqueEmail('layout'), password: STRONG_PASSWORD });
  const workspace = new WorkspacePage(page);
  const studyId = await workspace.createStudyNamed(
    'Reading-support programme, randomised by classroom, with a deliberately long title to wrap',
    'Layout test: pupils nested in classrooms, measured at baseline and three follow-ups.',
  );
  const put = await page.request.put(`/api/v1/studies/${studyId}/design`, { data: { baseRevision: 1, design: CLASSROOM_DESIGN } });
  expect(put.status(), await put.text()).toBe(200);

  for (const width of WIDTHS) {
    await page.setViewportSize({ width, height: 900 });

    await test.step(`studies table at ${width}px`, async () => {
      await workspace.goto(workspaceId);
      await expect(page.getByRole('link', { name: /Reading-support programme/ })).toBeVisible();
      await expectGoodLayout(page, 'studies table', width);
      // The studies table itself fits: no column is hidden behind a sideways scroll.
      const box = await page.getByRole('table').evaluate((t) => ({ content: t.parentElement!.scrollWidth, shown: t.parentElement!.clientWidth }));
      expect.soft(box.content, `the studies table at ${width}px`).toBeLessThanOrEqual(box.shown + 1);
    });

    for (const step of DESIGN_STEPS) {
      await test.step(`${step.label} step at ${width}px`, async () => {
        await page.goto(`/studies/${studyId}/design/${step.slug}`);
        await expect(page.getByRole('heading', { level: 2, name: step.label })).toBeVisible();
        await expectGoodLayout(page, `design step ${step.slug}`, width);
      });
    }

    for (const tab of [{ slug: '', label: 'Overview' }, ...STUDY_TABS.filter((t) => t.slug !== 'design')]) {
      await test.step(`${tab.label} tab at ${width}px`, async () => {
        await page.goto(`/studies/${studyId}${tab.slug ? `/${tab.slug}` : ''}`);
        await expect(page.getByRole('heading', { level: 1 })).toBeVisible();
        await page.waitForLoadState('networkidle');
        await expectGoodLayout(page, `study tab ${tab.slug || 'overview'}`, width);
      });
    }
  }

  await test.step('axe on the changed screens, at a phone’s and a laptop’s width', async () => {
    for (const width of [390, 1366]) {
      await page.setViewportSize({ width, height: 900 });
      await workspace.goto(workspaceId);
      await expect(page.getByRole('link', { name: /Reading-support programme/ })).toBeVisible();
      await expectNoSeriousA11yViolations(page, `studies table at ${width}px`);
      await page.goto(`/studies/${studyId}/design/occasions`);
      await expect(page.getByRole('heading', { level: 2, name: 'Occasions' })).toBeVisible();
      await expectNoSeriousA11yViolations(page, `Occasions step at ${width}px`);
      await page.goto(`/studies/${studyId}/checks`);
      await expect(page.getByRole('heading', { name: 'Recommended analysis' })).toBeVisible();
      await expectNoSeriousA11yViolations(page, `Checks tab at ${width}px`);
    }
  });
});
