/**
 * The awards, night-plan, fees and light-curve screens on the demo data in four modes — phone (390 × 844) and
 * desktop (1440 × 1000), light and dark — each checked with axe-core (colour contrast included,
 * which is where dark mode fails first) and photographed (.data/screenshots/modes-*). No screen
 * may scroll sideways at phone width: wide tables scroll inside their own region.
 */
import type { Browser, Page } from 'playwright-core';
import { axeViolations, describeViolations, launchBrowser, newPage, screenshot } from './support/browser';
import { signIn } from './support/session';

let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(() => browser?.close());

const MODES = [
  { name: 'phone-light', viewport: { width: 390, height: 844 }, colorScheme: 'light' as const },
  { name: 'phone-dark', viewport: { width: 390, height: 844 }, colorScheme: 'dark' as const },
  { name: 'desktop-light', viewport: { width: 1440, height: 1000 }, colorScheme: 'light' as const },
  { name: 'desktop-dark', viewport: { width: 1440, height: 1000 }, colorScheme: 'dark' as const },
];

/** Opens the round-0 cycle from a feature's cycle picker. */
async function roundZero(page: Page, path: string, url: RegExp): Promise<void> {
  await page.goto(path);
  await page.getByRole('link', { name: /-R0/ }).first().click();
  await page.waitForURL(url);
}

interface Screen {
  name: string;
  account: string;
  open(page: Page): Promise<void>;
  /** What must be on screen before the checks. */
  ready: string;
}

const SCREENS: Screen[] = [
  { name: 'awards', account: 'manager@halcyon.example', open: (p) => roundZero(p, '/awards', /\/awards\/\d+$/), ready: 'released' },
  {
    name: 'night-plans',
    account: 'manager@halcyon.example',
    open: (p) => roundZero(p, '/night-plans', /\/night-plans\/\d+$/),
    ready: 'build-last',
  },
  {
    name: 'fees-manage',
    account: 'manager@halcyon.example',
    open: (p) => roundZero(p, '/fees/manage', /\/fees\/manage\/\d+$/),
    ready: 'rate-card',
  },
  { name: 'fees-mine', account: 'billing@halcyon.example', open: (p) => p.goto('/fees').then(() => undefined), ready: 'invoices-table' },
  {
    name: 'fees-invoice',
    account: 'billing@halcyon.example',
    open: async (p) => {
      await p.goto('/fees');
      await p.locator('[data-testid^=invoice-row-] a').first().click();
      await p.waitForURL(/\/fees\/invoices\/\d+$/);
    },
    ready: 'invoice-lines',
  },
  { name: 'light-curves', account: 'proposer@halcyon.example', open: lightCurves, ready: 'photometry-table' },
  {
    name: 'light-curve-target',
    account: 'proposer@halcyon.example',
    open: async (p) => {
      await lightCurves(p);
      await p
        .locator('[data-testid^=photometry-row-]')
        .filter({ hasText: 'Measured' })
        .first()
        .locator('[data-testid^=photometry-row-link-]')
        .click();
      await p.waitForURL(/\/photometry\/\d+$/);
    },
    ready: 'folded-chart',
  },
];

/** The demo proposer's awarded cluster program, at its light curves. */
async function lightCurves(page: Page): Promise<void> {
  await page.goto('/proposals');
  const program = page
    .locator('tr')
    .filter({ has: page.getByText('Awarded', { exact: true }) })
    .first();
  await program.getByRole('link').first().click();
  await page.waitForURL(/\/proposals\/\d+\//);
  await page.goto(page.url().replace(/\/proposals\/(\d+)\/.*$/, '/proposals/$1/photometry'));
}

describe.each(MODES)('$name', (mode) => {
  it.each(SCREENS.map((s) => [s.name, s] as const))('%s: accessible, no sideways scrolling', async (_name, screen) => {
    const { context, page } = await newPage(browser, { colorScheme: mode.colorScheme });
    try {
      await page.setViewportSize(mode.viewport);
      await signIn(page, screen.account);
      await screen.open(page);
      await page.getByTestId(screen.ready).first().waitFor({ timeout: 20_000 });
      expect(describeViolations(await axeViolations(page))).toBe('');
      const overflow = await page.evaluate(() => {
        const pane = document.querySelector('mat-sidenav-content') ?? document.documentElement;
        return pane.scrollWidth - pane.clientWidth;
      });
      expect(overflow).toBeLessThanOrEqual(1);
      await screenshot(page, `modes-${screen.name}-${mode.name}`);
    } finally {
      await context.close();
    }
  });
});
