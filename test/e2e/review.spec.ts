/**
 * The committee's journey on the demo data (database/seeds/03-review.ts; `npm test` seeds a
 * fresh e2e database, so the demo reviewer starts with one of five grades in the cycle in
 * review, and the demo chair's panel at the panel stage with its standing not yet locked):
 * - the demo reviewer declares one conflict from the grading table (before opening that
 *   proposal), grades three proposals with the keyboard alone, reloads and finds them saved;
 * - the demo chair finds the panel under "Your panels", reads the grades (raw and normalised),
 *   moves one proposal in the standing with a reason, and locks the standing.
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

async function expectAxeClean(page: Page): Promise<void> {
  expect(describeViolations(await axeViolations(page))).toBe('');
}

/** Titles of the table's rows that are open for grading (not locked), in table order. */
async function openRows(page: Page): Promise<string[]> {
  const rows = page.locator('table.reviews tr.mat-mdc-row:not(.locked)');
  const count = await rows.count();
  const titles: string[] = [];
  for (let i = 0; i < count; i++) {
    const label = await rows.nth(i).locator('input.grade').getAttribute('aria-label');
    titles.push((label ?? '').replace(/^Grade for /, ''));
  }
  return titles;
}

describe('review', () => {
  it('a reviewer declares a conflict, grades three proposals from the keyboard, reloads and finds the grades saved', async () => {
    const { context, page } = await newPage(browser);
    try {
      await page.setViewportSize(DESKTOP);
      await signIn(page, 'reviewer@halcyon.example');
      await page.getByRole('link', { name: 'My reviews' }).first().click();
      await page.waitForURL(/\/review\/my$/);
      await page.locator('table.reviews tr.mat-mdc-row').first().waitFor();
      await screenshot(page, 'review-my-table');
      await expectAxeClean(page);

      const before = await openRows(page);
      expect(before.length).toBeGreaterThanOrEqual(4);

      // A conflict, declared from the table: the proposal's row goes and its page answers "not found".
      const conflicted = before[before.length - 1];
      await page.getByRole('button', { name: `Declare a conflict with ${conflicted}` }).click();
      const dialog = page.getByRole('dialog');
      await dialog.getByLabel('Reason').fill('I co-supervise a student on the proposing team.');
      await screenshot(page, 'review-conflict-dialog');
      await dialog.getByRole('button', { name: 'Declare conflict' }).click();
      await dialog.waitFor({ state: 'detached' });
      await page.getByLabel(`Grade for ${conflicted}`).waitFor({ state: 'detached' });

      // Three grades with the keyboard alone: type, Enter to the next row.
      const toGrade = (await openRows(page)).slice(0, 3);
      const grades = ['7.5', '4.0', '8.8'];
      await page.getByLabel(`Grade for ${toGrade[0]}`).focus();
      for (const g of grades) {
        await page.keyboard.press('ControlOrMeta+a');
        await page.keyboard.type(g);
        await page.keyboard.press('Enter');
      }
      await screenshot(page, 'review-my-typed');
      for (const title of toGrade) {
        const describedBy = await page.getByLabel(`Grade for ${title}`).getAttribute('aria-describedby');
        await page.locator(`#${describedBy}`).getByText('Saved').waitFor();
      }
      await screenshot(page, 'review-my-graded');

      await page.reload();
      await page.locator('table.reviews tr.mat-mdc-row').first().waitFor();
      for (const [i, title] of toGrade.entries()) {
        await expect(page.getByLabel(`Grade for ${title}`).inputValue()).resolves.toBe(Number(grades[i]).toFixed(1));
      }
      expect(await page.getByLabel(`Grade for ${conflicted}`).count()).toBe(0);

      // Reading one proposal: abstract, the technical assessment, the justification inline.
      await page.getByRole('link', { name: toGrade[0] }).first().click();
      await page.waitForURL(/\/review\/my\/\d+$/);
      await page.getByRole('heading', { level: 1 }).first().waitFor();
      await page.waitForLoadState('networkidle');
      await screenshot(page, 'review-reading');
      await expectAxeClean(page);
    } finally {
      await context.close();
    }
  });

  it('the chair reads the grades, moves one proposal with a reason and locks the standing', async () => {
    const { context, page } = await newPage(browser);
    try {
      await page.setViewportSize(DESKTOP);
      await signIn(page, 'chair@halcyon.example');
      await page.getByRole('link', { name: 'My reviews' }).first().click();
      await page
        .getByRole('link', { name: /^Grades and standing of / })
        .first()
        .click();
      await page.waitForURL(/\/review\/panels\/\d+$/);
      await page.getByRole('heading', { level: 1 }).first().waitFor();
      await page.getByRole('tab', { name: 'Grades' }).waitFor();
      await page.waitForLoadState('networkidle');
      await screenshot(page, 'review-panel-grades');
      await expectAxeClean(page);

      await page.getByRole('tab', { name: 'Standing' }).click();
      const list = page.getByTestId('standing-list');
      await list.waitFor();
      const second = list.locator('li').nth(1);
      const secondId = await second.getAttribute('data-testid');
      const upButton = second.getByRole('button', { name: /up from position 2$/ });
      const title = ((await upButton.getAttribute('aria-label')) ?? '').replace(/^Move /, '').replace(/ up from position 2$/, '');
      await upButton.click();
      const dialog = page.getByRole('dialog');
      await dialog.getByLabel('Reason for the move').fill('The panel agreed its case is the stronger of the two.');
      await dialog.getByRole('button', { name: 'Move' }).click();
      await dialog.waitFor({ state: 'detached' });
      // The moved proposal now heads the list.
      await list.locator('li').first().and(page.getByTestId(secondId!)).waitFor();
      await page.getByTestId('standing-moves').getByText('The panel agreed its case is the stronger of the two.').waitFor();
      expect(await page.getByTestId('standing-moves').innerText()).toContain(title);
      await screenshot(page, 'review-panel-standing');
      await expectAxeClean(page);

      await page.getByRole('button', { name: 'Lock standing' }).click();
      const confirm = page.getByRole('dialog');
      await confirm.getByText('Locking is final').waitFor();
      await confirm.getByRole('button', { name: 'Lock standing' }).click();
      await page.getByTestId('standing-locked').waitFor();
      expect(await page.getByRole('button', { name: /up from position/ }).count()).toBe(0);
      await screenshot(page, 'review-panel-locked');

      await page.getByRole('tab', { name: 'Pressure' }).click();
      await page.locator('canvas').first().waitFor();
      await page.waitForLoadState('networkidle');
      await screenshot(page, 'review-panel-pressure');
      await expectAxeClean(page);
    } finally {
      await context.close();
    }
  });

  it('the facility manager sees the assignment matrix of a panel', async () => {
    const { context, page } = await newPage(browser);
    try {
      await page.setViewportSize(DESKTOP);
      await signIn(page, 'manager@halcyon.example');
      await page.getByRole('link', { name: 'Review' }).first().click();
      await page.waitForURL(/\/review\/manage$/);
      await page.getByRole('link', { name: /-R2/ }).first().click();
      await page.waitForURL(/\/review\/manage\/\d+$/);
      await page.getByTestId('panel-list').waitFor();
      await page.waitForLoadState('networkidle');
      await screenshot(page, 'review-manage-cycle');
      await expectAxeClean(page);
      await page.getByRole('link', { name: 'Assign reviewers' }).first().click();
      await page.waitForURL(/\/panels\/\d+$/);
      await page.getByRole('heading', { name: /^Reviewers of / }).waitFor();
      await page.waitForLoadState('networkidle');
      await screenshot(page, 'review-manage-matrix');
      await expectAxeClean(page);
    } finally {
      await context.close();
    }
  });
});
