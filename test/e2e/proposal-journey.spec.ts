import { writeFileSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import PDFDocument from 'pdfkit';
import type { Browser } from 'playwright-core';
import { axeViolations, describeViolations, launchBrowser, newPage, screenshot, screenshotOf } from './support/browser';
import { BASE_URL, e2eMailboxUrl } from './support/e2e-env';
import { signIn } from './support/session';

let browser: Browser;
const work = mkdtempSync(path.join(tmpdir(), 'spincycle-e2e-'));

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(() => browser?.close());

/** A small justification PDF made on the spot (invented text). */
function makePdf(file: string): Promise<void> {
  return new Promise((resolve) => {
    const doc = new PDFDocument({ size: 'A4' });
    const chunks: Buffer[] = [];
    doc.on('data', (c: Buffer) => chunks.push(c));
    doc.on('end', () => {
      writeFileSync(file, Buffer.concat(chunks));
      resolve();
    });
    doc.fontSize(14).text('Scientific justification: rotation of field stars from the example list.');
    doc.end();
  });
}

const ABSTRACT =
  'We will measure the rotation periods of the stars of the example list from starspot modulation, ' +
  'with nightly photometry on two nodes over the campaign, to place them on the spin-down sequence and date them.';

describe('a proposer’s journey', () => {
  it('creates a proposal, uploads the example CSV, sees the plans, uploads a PDF, submits, and finds the receipt in the mailbox', async () => {
    const { context, page } = await newPage(browser);
    const title = `Example-list rotation periods ${Date.now()}`;
    try {
      await signIn(page, 'proposer@halcyon.example');
      await page.getByRole('link', { name: 'Proposals', exact: true }).first().click();
      await page.getByRole('heading', { name: 'Proposals', level: 1 }).waitFor();
      // The demo data: the submitted cluster survey is listed.
      await page.getByText('Lantern cluster rotation survey').first().waitFor();
      await screenshot(page, 'proposals-list');
      expect(describeViolations(await axeViolations(page))).toBe('');

      // New draft.
      await page.getByRole('button', { name: /New proposal/ }).click();
      const dialog = page.getByRole('dialog');
      await dialog.getByLabel('Title').fill(title);
      await dialog.getByRole('button', { name: 'Create draft' }).click();
      await page.waitForURL(/\/proposals\/\d+\/overview$/);
      const proposalUrl = page.url().replace(/\/overview$/, '');

      // Overview: autosaved.
      await page.getByLabel('Abstract').fill(ABSTRACT);
      await page.getByLabel('Science category').click();
      await page.getByRole('option', { name: 'Field stars and planet hosts' }).click();
      await page.getByRole('checkbox', { name: 'KRG-50' }).check();
      await page.getByRole('checkbox', { name: 'PSR-100' }).check();
      await page.getByText(/Saved \d\d:\d\d/).waitFor();
      await screenshot(page, 'proposal-overview');
      expect(describeViolations(await axeViolations(page))).toBe('');

      // Targets: the example CSV, fetched as a person would download it.
      const example = await (await context.request.get(`${BASE_URL}/api/target-lists/example.csv`)).text();
      expect(example.split('\n')[0]).toMatch(/^name,ra,dec,magnitude,band,colour,colour_system/);
      const csv = path.join(work, 'example.csv');
      writeFileSync(csv, example);
      await page.getByRole('tab', { name: 'Targets' }).click();
      await page.getByTestId('csv-input').setInputFiles(csv);
      await page.getByRole('button', { name: 'Upload', exact: true }).click();
      const rows = example.trim().split('\n').length - 1;
      await page
        .getByText(new RegExp(`${rows} (targets|rows)`))
        .first()
        .waitFor();
      await screenshot(page, 'proposal-targets');
      expect(describeViolations(await axeViolations(page))).toBe('');

      // Plans: computed by the worker; the page shows progress, then the table and totals.
      await page.getByRole('tab', { name: 'Plans' }).click();
      await page.getByTestId('plans-table').waitFor({ timeout: 60_000 });
      await page.getByTestId('request-table').getByText('KRG-50').waitFor();
      await page.getByTestId('plan-progress').waitFor({ state: 'detached', timeout: 60_000 });
      await page.waitForLoadState('networkidle');
      await screenshot(page, 'proposal-plans');
      expect(describeViolations(await axeViolations(page))).toBe('');
      // Every number of a plan explains itself.
      await page
        .getByRole('button', { name: /^Explain/ })
        .first()
        .click();
      await page.getByRole('dialog').getByTestId('quantities').getByText('Expected rotation period').waitFor();
      await screenshotOf(page.getByRole('dialog'), 'proposal-explain-panel');
      expect(describeViolations(await axeViolations(page))).toBe('');
      await page.keyboard.press('Escape');
      await page.getByRole('dialog').waitFor({ state: 'detached' });

      // One click away: the sky window of the first target.
      await page
        .getByRole('button', { name: /Sky window/ })
        .first()
        .click();
      await page.getByRole('dialog').locator('app-sky-window-chart').waitFor();
      await page
        .getByRole('dialog')
        .getByText(/observable on \d+ of \d+ nights/)
        .first()
        .waitFor();
      await screenshotOf(page.getByRole('dialog'), 'proposal-sky-window-dialog');
      await page.keyboard.press('Escape');

      // Justification PDF.
      const pdf = path.join(work, 'justification.pdf');
      await makePdf(pdf);
      await page.getByRole('tab', { name: 'Justification' }).click();
      await page.getByTestId('pdf-input').setInputFiles(pdf);
      await page.getByRole('button', { name: 'Upload', exact: true }).click();
      await page.getByTestId('justification-file').getByText('justification.pdf').waitFor();

      // Submit.
      await page.getByRole('tab', { name: 'Submit' }).click();
      const submit = page.getByRole('button', { name: 'Submit proposal' });
      await submit.waitFor();
      await page.waitForFunction(() => !document.querySelector('button.cta')?.hasAttribute('disabled'), undefined, { timeout: 30_000 });
      await screenshot(page, 'proposal-submit');
      expect(describeViolations(await axeViolations(page))).toBe('');
      await submit.click();
      await page.getByRole('dialog').getByRole('button', { name: 'Submit', exact: true }).click();
      await page.getByTestId('submitted-state').waitFor();
      await screenshot(page, 'proposal-submitted');

      // The receipt, in the development mailbox.
      const mailbox = await context.newPage();
      await mailbox.goto(e2eMailboxUrl('proposer@halcyon.example'));
      await mailbox
        .getByRole('heading', { name: new RegExp(title.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')) })
        .first()
        .waitFor();
      const receipt = await mailbox.locator('article').first().innerText();
      expect(receipt).toMatch(/KRG-50/);
      expect(receipt).toMatch(/node-hours/i);
      await screenshot(mailbox, 'mailbox-receipt');

      // Read-only afterwards.
      await page.goto(`${proposalUrl}/overview`);
      await expect(page.getByLabel('Abstract').isEditable()).resolves.toBe(false);
    } finally {
      await context.close();
    }
  });

  it('a facility manager sees the cycle with its node capacity', async () => {
    const { context, page } = await newPage(browser);
    try {
      await signIn(page, 'manager@halcyon.example');
      await page.getByRole('link', { name: 'Cycles' }).first().click();
      await page
        .getByRole('cell', { name: /Spin-down monitoring/ })
        .first()
        .waitFor();
      await page.waitForLoadState('networkidle');
      await screenshot(page, 'cycles');
      expect(describeViolations(await axeViolations(page))).toBe('');
    } finally {
      await context.close();
    }
  });
});
