import type { Page } from '@playwright/test';
import { expectNoSeriousA11yViolations as checkA11y } from './axe';

/**
 * axe at a phone's (390 px) and a laptop's (1366 px) width; with UNITWISE_SCREENSHOTS=<folder>
 * a full-page picture of each for review. The viewport is put back to 1280 × 900 afterwards.
 */
export async function atBothWidths(page: Page, name: string): Promise<void> {
  for (const width of [390, 1366]) {
    await page.setViewportSize({ width, height: 900 });
    await checkA11y(page, `${name} at ${width} px`);
    const folder = process.env.UNITWISE_SCREENSHOTS;
    if (folder) await page.screenshot({ path: `${folder}/${name}-${width}.png`, fullPage: true });
  }
  await page.setViewportSize({ width: 1280, height: 900 });
}
