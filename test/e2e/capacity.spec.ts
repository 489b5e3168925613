import { copyFileSync } from 'node:fs';
import type { Browser, Page } from 'playwright-core';
import { axeViolations, describeViolations, launchBrowser, newPage, screenshot } from './support/browser';
import { signIn } from './support/session';

/**
 * Capacity in view, on the demo data. The facility manager cuts KRG-50's capacity below what
 * the submitted "Lantern cluster rotation survey" asks there (the server wants a confirmation,
 * given in a dialog), so that the overrun does not depend on the science model's exact hours;
 * then the manager's list shows the pressure and the flagged proposal, and the team sees the
 * overrun on the request table and on the submit checklist of one of their demo drafts. The capacity is put back at the end (a raise needs no confirmation).
 */
let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});

const PHONE = { width: 390, height: 844 };
const DESKTOP = { width: 1440, height: 900 };
const LANTERN = 'Lantern cluster rotation survey';
/** The proposer's demo drafts; the first that asks KRG-50 for node-hours shows the checklist. */
const DRAFTS = ['Spot lifetimes in young K dwarfs', 'Ages of nearby planet hosts'];
let draft = '';

/** KRG-50's capacity before the test cut it (restored afterwards), and the cut. */
let originalCapacity: number | null = null;
let cutCapacity = 0;
/** Node-hours the two demo proposals request on KRG-50 (read from their overviews). */
const krgRequest: Record<string, number> = {};

afterAll(async () => {
  try {
    if (originalCapacity !== null) {
      const { context, page } = await newPage(browser);
      try {
        await signIn(page, 'manager@halcyon.example');
        await setKrgCapacity(page, originalCapacity);
        await page.waitForURL(/\/cycles$/);
      } finally {
        await context.close();
      }
    }
  } finally {
    await browser?.close();
  }
});

/** A full-page shot at 1440 px and at phone width, kept in .data/screenshots and copied to /tmp. */
async function shots(page: Page, name: string): Promise<void> {
  for (const [suffix, size] of [
    ['1440', DESKTOP],
    ['phone', PHONE],
  ] as const) {
    await page.setViewportSize(size);
    await page.waitForTimeout(200);
    const file = await screenshot(page, `capacity-${name}-${suffix}`);
    copyFileSync(file, `/tmp/capacity-${name}-${suffix}.png`);
  }
  await page.setViewportSize(DESKTOP);
}

async function expectAxeClean(page: Page): Promise<void> {
  expect(describeViolations(await axeViolations(page))).toBe('');
}

const hours = (text: string | null) => Number((text ?? '').replace(/[^\d.]/g, ''));

/** Opens the demo cycle's form and types KRG-50's capacity, then saves. */
async function setKrgCapacity(page: Page, value: number): Promise<void> {
  await page.goto('/cycles');
  await page
    .getByRole('link', { name: /^Edit / })
    .first()
    .click();
  const input = page.locator('[data-testid^=node-row-]').filter({ hasText: 'KRG-50' }).getByLabel('Available (node-hours)');
  await input.waitFor();
  await input.fill(String(value));
  await page.getByRole('button', { name: 'Save cycle' }).click();
}

async function openProposal(page: Page, title: string): Promise<void> {
  await page.goto('/proposals');
  await page.getByRole('link', { name: title }).first().click();
  await page.waitForURL(/\/proposals\/\d+\/overview$/);
}

describe('capacity in view', () => {
  it('the team reads what each proposal asks of KRG-50 on its request table', async () => {
    const { context, page } = await newPage(browser);
    try {
      await signIn(page, 'proposer@halcyon.example');
      for (const title of [LANTERN, ...DRAFTS]) {
        await openProposal(page, title);
        const row = page.getByTestId('overview-request-table').getByTestId('request-KRG-50');
        await row.waitFor();
        krgRequest[title] = hours(await row.locator('td.hours').textContent());
      }
      expect(krgRequest[LANTERN]).toBeGreaterThan(0);
      draft = DRAFTS.find((t) => krgRequest[t] > 0) ?? '';
      expect(draft).not.toBe('');
    } finally {
      await context.close();
    }
  });

  it('the manager cuts KRG-50 below the requests after a confirmation, then sees the pressure and the flagged proposal', async () => {
    const { context, page } = await newPage(browser);
    await page.setViewportSize(DESKTOP);
    try {
      await signIn(page, 'manager@halcyon.example');
      await page.getByRole('link', { name: 'Cycles' }).first().click();
      await page
        .getByRole('link', { name: /^Edit / })
        .first()
        .click();
      await page.locator('app-cycle-form').getByTestId('closes-utc').waitFor();
      // UTC written once per instant; the times are 24-hour text fields.
      await expect(page.locator('app-cycle-form').getByTestId('closes-utc').textContent()).resolves.toMatch(
        /^\d{1,2} \w{3} \d{4}, \d\d:\d\d UTC$/,
      );
      await expect(page.getByLabel('Closes at').getAttribute('type')).resolves.toBe('text');
      await shots(page, 'cycle-form');
      await expectAxeClean(page);

      const input = page.locator('[data-testid^=node-row-]').filter({ hasText: 'KRG-50' }).getByLabel('Available (node-hours)');
      originalCapacity = Number(await input.inputValue());
      cutCapacity = Math.floor(Math.min(krgRequest[LANTERN], krgRequest[draft]) / 2);
      await input.fill(String(cutCapacity));
      await page.getByRole('button', { name: 'Save cycle' }).click();
      const dialog = page.getByRole('dialog');
      await dialog.getByText('Cut capacity below the requests?').waitFor();
      await expect(dialog.textContent()).resolves.toMatch(
        new RegExp(`KRG-50: submitted proposals request [\\d.]+ node-hours; the new capacity is ${cutCapacity}\\.`),
      );
      // Checked once the opening animation is over (mid-fade, every text is a contrast failure).
      await page.waitForFunction(() => {
        const surface = document.querySelector('.mat-mdc-dialog-surface');
        return (
          !!surface && getComputedStyle(surface).opacity === '1' && !document.querySelector('.mat-mdc-dialog-container.mdc-dialog--opening')
        );
      });
      await expectAxeClean(page);
      await dialog.getByRole('button', { name: 'Cut capacity' }).click();
      await page.waitForURL(/\/cycles$/);
      await page.getByRole('button', { name: 'Dismiss' }).click();

      await page
        .getByRole('link', { name: /^Proposals of / })
        .first()
        .click();
      await page.waitForURL(/\/cycles\/\d+\/proposals$/);
      const pressure = page.getByTestId('pressure-KRG-50');
      await pressure.waitFor();
      await expect(pressure.textContent()).resolves.toContain('Over capacity');
      await expect(pressure.textContent()).resolves.toMatch(new RegExp(`of ${cutCapacity} node-hours`));
      const row = page.getByRole('row').filter({ hasText: LANTERN });
      await expect(row.textContent()).resolves.toMatch(new RegExp(`KRG-50\\s*[\\d,.]+ / ${cutCapacity}\\s*warning\\s*Over capacity`));
      await expect(row.textContent()).resolves.toContain('Mara Quillfeather');
      await page.waitForLoadState('networkidle');
      await shots(page, 'manager-pressure');
      await expectAxeClean(page);
    } finally {
      await context.close();
    }
  });

  it('the team sees the overrun flagged on the request table and on the submit checklist', async () => {
    const { context, page } = await newPage(browser);
    await page.setViewportSize(DESKTOP);
    try {
      await signIn(page, 'proposer@halcyon.example');
      await openProposal(page, LANTERN);
      const table = page.getByTestId('overview-request-table');
      const krg = table.getByTestId('request-KRG-50');
      await krg.getByTestId('over-capacity-flag').waitFor();
      await expect(krg.locator('td.num').nth(1).textContent()).resolves.toBe(String(cutCapacity));
      await expect(table.getByTestId('request-VHM-40').getByTestId('over-capacity-flag').count()).resolves.toBe(0);
      await expect(page.getByTestId('over-capacity-note').textContent()).resolves.toMatch(/asks more node-hours on\s*KRG-50/);
      await page.getByTestId('over-capacity-note').scrollIntoViewIfNeeded();
      await shots(page, 'request-table');
      await expectAxeClean(page);

      // The Plans tab's request table flags the same node, and only it.
      await page.getByRole('tab', { name: 'Plans' }).click();
      const plansRequest = page.getByTestId('request-table');
      await plansRequest.getByTestId('request-KRG-50').getByTestId('over-capacity-flag').waitFor();
      await expect(plansRequest.getByTestId('request-VHM-40').getByTestId('over-capacity-flag').count()).resolves.toBe(0);

      // The draft's submit checklist: a warning (the demo cycle warns, it does not block).
      await openProposal(page, draft);
      await page.getByRole('tab', { name: 'Submit' }).click();
      const caution = page.getByTestId('capacity-caution');
      await caution.waitFor();
      await expect(caution.textContent()).resolves.toMatch(
        new RegExp(`node-hours are requested on KRG-50, more than the ${cutCapacity} the cycle offers there`),
      );
      await shots(page, 'submit-checklist');
      await expectAxeClean(page);
    } finally {
      await context.close();
    }
  });
});
