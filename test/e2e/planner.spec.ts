import type { Browser } from 'playwright-core';
import { axeViolations, describeViolations, launchBrowser, newPage, screenshot, screenshotOf } from './support/browser';
import { signIn } from './support/session';

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(() => browser?.close());

describe('target planner', () => {
  it('shows a live plan with explained numbers and charts, recomputes on input, and draws sky windows per node', async () => {
    const { context, page } = await newPage(browser);
    try {
      await signIn(page, 'reviewer@halcyon.example');
      await page.getByRole('link', { name: 'Target planner' }).first().click();
      await page.getByRole('heading', { name: 'Target planner', level: 1 }).waitFor();
      await page.getByRole('heading', { name: /The plan on/ }).waitFor();
      await page.getByText(/Angus et al\. \(2019\)/).first().waitFor();

      // Changing the age changes the expected period shown.
      const periodText = async () => (await page.locator('main').innerText()).match(/(\d+(?:\.\d+)?)\s*d\b/)?.[1];
      const before = await periodText();
      await page.getByLabel('Age', { exact: true }).fill('3000');
      await page.waitForFunction((prev) => !document.querySelector('main')!.textContent!.includes(`${prev} d`), before, { timeout: 5000 }).catch(() => undefined);
      expect(await periodText()).not.toEqual(before);
      expect(await page.locator('main').innerText()).not.toMatch(/NaN/);

      // Sky windows: a position and the open demo cycle.
      await page.getByLabel('Right ascension').fill('10:52:48');
      await page.getByLabel('Declination').fill('+31:36:00');
      await page.getByTestId('cycle-select').click();
      await page.getByRole('option', { name: /Spin-down monitoring/ }).click();
      await page.locator('app-sky-window-chart').first().waitFor();
      await page.getByText(/observable on \d+ of \d+ nights/).first().waitFor();
      await page.waitForLoadState('networkidle');
      await screenshot(page, 'planner');
      await screenshotOf(page.locator('section[aria-labelledby="plan-heading"]'), 'planner-plan');
      await screenshotOf(page.locator('section[aria-labelledby="gyro-heading"]'), 'planner-gyrochronology');
      await screenshotOf(page.locator('section[aria-labelledby="sky-heading"]'), 'planner-sky-window');
      expect(describeViolations(await axeViolations(page))).toBe('');

      // A bad declination is named under its field, and nothing breaks.
      await page.getByLabel('Declination').fill('95.2');
      await page.getByTestId('dec-error').getByText(/90/).waitFor();
    } finally {
      await context.close();
    }
  });
});
