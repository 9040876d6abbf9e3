import AxeBuilder from '@axe-core/playwright';
import { expect, type Page } from '@playwright/test';

export const WCAG_TAGS = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'];

/** Runs axe on the current page and fails with a readable list of serious or critical violations. */
export async function expectNoSeriousA11yViolations(page: Page, label: string): Promise<void> {
  const results = await new AxeBuilder({ page }).withTags(WCAG_TAGS).analyze();
  const serious = results.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical');
  const report = serious
    .map((v) => {
      const nodes = v.nodes.map((n) => `    - ${n.target.join(' ')}${n.failureSummary ? `\n      ${n.failureSummary.replace(/\n/g, '\n      ')}` : ''}`);
      return `  ${v.id} [${v.impact}]: ${v.help} (${v.helpUrl})\n${nodes.join('\n')}`;
    })
    .join('\n');
  expect(serious.length, `${label} (${page.url()}) has ${serious.length} serious/critical axe violation(s):\n${report}`).toBe(0);
}
