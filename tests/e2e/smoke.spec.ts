/**
 * Pipeline smoke test: the app answers its health check with 200 JSON, through the real browser.
 */
import { expect, test } from '@playwright/test';

test('GET /api/health answers 200 with JSON status ok', async ({ page }) => {
  const response = await page.goto('/api/health');
  expect(response, 'no response for /api/health').not.toBeNull();
  expect(response!.status()).toBe(200);
  expect(response!.headers()['content-type']).toContain('application/json');
  expect(await response!.json()).toMatchObject({ status: 'ok' });
});
