/**
 * From the standing to the nights, on the demo data (database/seeds/04-awards.ts and
 * 05-night-plans.ts: the round-0 cycle has a locked standing, released decisions and built
 * night plans):
 * - the facility manager promotes the reserve proposal to awarded on the award board (after the
 *   release, so its team is told), builds the night plans again and watches the progress bar
 *   until the worker is done, opens one night's plan, marks the night lost and watches the
 *   re-plan, which leaves the night marked lost on the timeline;
 * - the PI of an awarded program sees its progress and the chance of recovering its periods on
 *   the proposal's page.
 * Each page is checked with axe-core and photographed (.data/screenshots/).
 */
import type { Browser, Page } from 'playwright-core';
import { axeViolations, describeViolations, launchBrowser, newPage, screenshot } from './support/browser';
import { signIn } from './support/session';

let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(() => browser?.close());

const DESKTOP = { width: 1440, height: 1000 };
/** A build of the demo campaign takes the worker some seconds; a slow machine, a minute. */
const BUILD_MS = 120_000;

async function expectAxeClean(page: Page): Promise<void> {
  expect(describeViolations(await axeViolations(page))).toBe('');
}

/** The round-0 cycle's page of a feature (awards or night plans), from its cycle picker. */
async function openRoundZero(page: Page, link: string, path: RegExp): Promise<void> {
  await page.getByRole('link', { name: link, exact: true }).first().click();
  await page.getByRole('link', { name: /-R0/ }).first().click();
  await page.waitForURL(path);
  await page.getByRole('heading', { level: 1 }).first().waitFor();
}

/** Waits until the page says a build of this kind is done (the previous one was of the other kind). */
async function waitForBuild(page: Page, done: RegExp): Promise<void> {
  await page.getByTestId('build-last').filter({ hasText: done }).waitFor({ timeout: BUILD_MS });
  expect(await page.getByTestId('build-failed').count()).toBe(0);
}

describe('awards and night plans', () => {
  it('the manager promotes a reserve proposal, builds the night plans with a progress bar, marks a night lost and re-plans', async () => {
    const { context, page } = await newPage(browser);
    try {
      await page.setViewportSize(DESKTOP);
      await signIn(page, 'manager@halcyon.example');

      // The award board of a released cycle: the reserve proposal is awarded what it asks.
      await openRoundZero(page, 'Awards', /\/awards\/\d+$/);
      await page.getByTestId('released').waitFor();
      const reserve = page.locator('[data-testid^=outcome-]').filter({ hasText: 'Reserve' }).first();
      const proposalId = ((await reserve.getAttribute('data-testid')) ?? '').replace('outcome-', '');
      expect(proposalId).toMatch(/^\d+$/);
      await reserve.click();
      await page.getByRole('option', { name: 'Awarded', exact: true }).click();
      await page.getByTestId(`save-${proposalId}`).click();
      await page.getByTestId(`status-${proposalId}`).getByText('Saved').waitFor();
      await screenshot(page, 'awards-board-promoted');
      await expectAxeClean(page);

      // Night plans: build again and watch the bar move to done.
      await openRoundZero(page, 'Night plans', /\/night-plans\/\d+$/);
      await page.getByTestId('build-last').waitFor();
      await page.getByTestId('build-button').click();
      const bar = page.getByRole('progressbar', { name: 'Progress of the build' });
      await bar.waitFor({ timeout: BUILD_MS });
      await screenshot(page, 'night-plans-building');
      // The demo's last build was a re-plan: "Last built" is this build's.
      await waitForBuild(page, /Last built/);
      await page.getByTestId('timeline-chart').first().waitFor();
      await screenshot(page, 'night-plans-built');
      await expectAxeClean(page);

      // One night's plan, then the night lost: the node is re-planned from it.
      const night = page.locator('[data-testid^=night-]:not(.lost)').nth(12);
      const date = ((await night.getAttribute('data-testid')) ?? '').replace('night-', '');
      expect(date).toMatch(/^\d{4}-\d{2}-\d{2}$/);
      await night.click();
      const dialog = page.getByRole('dialog');
      await dialog.getByTestId('night-summary').waitFor();
      await screenshot(page, 'night-plans-night');
      await expectAxeClean(page);
      await dialog.getByTestId('mark-night-lost').click();
      const lost = page.getByRole('dialog').filter({ has: page.getByTestId('lost-caution') });
      await lost.getByTestId('lost-reason').fill('Dome closed all night: high wind.');
      await lost.getByTestId('lost-submit').click();
      await lost.waitFor({ state: 'detached' });
      if (await page.getByRole('dialog').count()) await page.keyboard.press('Escape');
      await waitForBuild(page, /Last re-planned/);
      await page.locator(`[data-testid="night-${date}"].lost`).waitFor();
      await screenshot(page, 'night-plans-replanned');
    } finally {
      await context.close();
    }
  });

  it('the PI of an awarded program sees its progress and the chance of recovering its periods', async () => {
    const { context, page } = await newPage(browser);
    try {
      await page.setViewportSize(DESKTOP);
      // Which demo proposer leads a program depends on the plans of the day: read it from the manager's page.
      await signIn(page, 'manager@halcyon.example');
      await openRoundZero(page, 'Night plans', /\/night-plans\/\d+$/);
      const programs = page.getByTestId('programs-section');
      await programs.locator('tbody tr').first().waitFor();
      const text = await programs.innerText();
      const pi = /\n\s*([A-Z][a-z]+ [A-Z][\w-]+) · (?:Observing|Scheduled)/.exec(text)?.[1];
      expect(pi).toBeTruthy();
      await page.context().clearCookies();

      await signIn(page, `${pi!.toLowerCase().replace(' ', '.')}@halcyon.example`);
      await page.getByRole('link', { name: 'Proposals' }).first().click();
      // Exactly "Awarded" (not "Not awarded").
      const awarded = page
        .locator('tr')
        .filter({ has: page.getByText('Awarded', { exact: true }) })
        .first();
      await awarded.waitFor();
      await awarded.getByRole('link').first().click();
      const card = page.getByTestId('program-progress-card');
      await card.waitFor();
      expect(await card.getByTestId('program-visits').innerText()).toMatch(/done/i);
      await card.getByTestId('program-recovery-why').click();
      await card.getByTestId('program-recovery-explanation').waitFor();
      await screenshot(page, 'night-plans-program-progress');
      await expectAxeClean(page);
    } finally {
      await context.close();
    }
  });
});
