/**
 * Fees on the demo data (database/seeds/06-billing.ts: the demo billing contact has a paid, an
 * overdue and a recent invoice of the round-0 cycle):
 * - the billing contact opens an unpaid invoice, pays it with the payment provider's success test
 *   card (fakes/payments, through the SDK), watches it wait for the provider's signed event and
 *   become paid, downloads the receipt PDF, and finds the receipt mail in the mailbox;
 * - the facility manager sees the cycle's fees (chart, invoices, rate card).
 * Each page is checked with axe-core and photographed (.data/screenshots/).
 */
import type { Browser, Page } from 'playwright-core';
import { axeViolations, describeViolations, launchBrowser, newPage, screenshot } from './support/browser';
import { e2eMailboxUrl } from './support/e2e-env';
import { signIn } from './support/session';

let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(() => browser?.close());

async function expectAxeClean(page: Page): Promise<void> {
  expect(describeViolations(await axeViolations(page))).toBe('');
}

describe('fees', () => {
  it('the billing contact pays an invoice by card, sees it paid after the provider’s event, downloads the receipt and has it by mail', async () => {
    const { context, page } = await newPage(browser);
    try {
      await page.setViewportSize({ width: 1440, height: 1000 });
      await signIn(page, 'billing@halcyon.example');
      await page.getByRole('link', { name: 'Fees', exact: true }).first().click();
      await page.getByTestId('invoices-table').waitFor();
      await expectAxeClean(page);
      await screenshot(page, 'fees-my-invoices');

      // An invoice awaiting payment (in the demo data, one of them is past its due date).
      const row = page
        .locator('[data-testid^=invoice-row-]')
        .filter({ hasText: /awaiting payment/i })
        .first();
      const invoiceId = ((await row.getAttribute('data-testid')) ?? '').replace('invoice-row-', '');
      expect(invoiceId).toMatch(/^\d+$/);
      await page.goto(`/fees/invoices/${invoiceId}`);
      await page.getByTestId('invoice-lines').waitFor();
      await expect(page.getByTestId('invoice-caution').textContent()).resolves.toMatch(/terms and local tax rules govern/);
      const number = ((await page.getByRole('heading', { level: 1 }).first().textContent()) ?? '').replace('Invoice', '').trim();
      await expectAxeClean(page);
      await screenshot(page, 'fees-invoice');

      await page.getByTestId('pay-button').click();
      await page.getByTestId('card-number').fill('4242 4242 4242 4242');
      await page.getByTestId('exp-month').fill('12');
      await page.getByTestId('exp-year').fill(String(new Date().getUTCFullYear() + 3));
      await page.getByTestId('cvc').fill('123');
      // Every field is valid: no error message may still be on screen (or fading out) when axe looks.
      await page.getByTestId('pay-amount').click();
      await page.waitForFunction(() => document.querySelectorAll('mat-error').length === 0, null, { timeout: 5000 });
      await page.waitForTimeout(300);
      await expectAxeClean(page);
      await screenshot(page, 'fees-pay-dialog');
      await page.getByTestId('pay-submit').click();
      // Paid only once the provider's signed event has reached the server.
      await page.getByTestId('pay-paid').waitFor({ timeout: 30_000 });
      await screenshot(page, 'fees-paid');
      const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('pay-receipt').click()]);
      expect(download.suggestedFilename()).toBe(`receipt-${number}.pdf`);
      const pdf = await download.createReadStream().then(
        (stream) =>
          new Promise<Buffer>((resolve, reject) => {
            const chunks: Buffer[] = [];
            stream.on('data', (c: Buffer) => chunks.push(c));
            stream.on('end', () => resolve(Buffer.concat(chunks)));
            stream.on('error', reject);
          }),
      );
      expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');
      await page.getByTestId('pay-close').click();
      await page.getByTestId('receipt-pdf').waitFor();

      // The receipt mail: sent after the event, through the outbox.
      let found = false;
      for (let i = 0; i < 40 && !found; i++) {
        await page.goto(e2eMailboxUrl('billing@halcyon.example'));
        found = (await page.getByText(`Receipt for invoice ${number}`).count()) > 0;
        if (!found) await page.waitForTimeout(250);
      }
      expect(found).toBe(true);
    } finally {
      await context.close();
    }
  });

  it('the facility manager sees the cycle’s fees: totals by state, the invoices and the rate card', async () => {
    const { context, page } = await newPage(browser);
    try {
      await page.setViewportSize({ width: 1440, height: 1000 });
      await signIn(page, 'manager@halcyon.example');
      await page.goto('/fees/manage');
      await page.getByRole('link', { name: /-R0/ }).first().click();
      await page.waitForURL(/\/fees\/manage\/\d+$/);
      await page.getByRole('heading', { level: 1 }).first().waitFor();
      await page
        .getByText(/rate card/i)
        .first()
        .waitFor();
      await expectAxeClean(page);
      await screenshot(page, 'fees-manage');
    } finally {
      await context.close();
    }
  });
});
