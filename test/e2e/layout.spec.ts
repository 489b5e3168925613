import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { Browser, FileChooser, Locator, Page } from 'playwright-core';
import { axeViolations, describeViolations, launchBrowser, newPage } from './support/browser';
import { signIn } from './support/session';

let browser: Browser;
const work = mkdtempSync(path.join(tmpdir(), 'spincycle-layout-'));

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(() => browser?.close());

const DESKTOP = { width: 1440, height: 900 };
const PHONE = { width: 390, height: 844 };

/**
 * Screenshots looked at by the engineer: /tmp/layout-<name>.png. The app shell scrolls inside
 * its content pane, so the viewport is made as tall as the content for the shot.
 */
async function shot(page: Page, name: string): Promise<void> {
  await page.waitForFunction(() => document.getAnimations().every((a) => a.playState !== 'running'));
  const viewport = page.viewportSize()!;
  const contentHeight = await page.evaluate(() =>
    Math.max(
      ...Array.from(document.querySelectorAll('mat-sidenav-content, main, body')).map(
        (e) => e.scrollHeight + (e.getBoundingClientRect().top || 0),
      ),
    ),
  );
  if (contentHeight > viewport.height)
    await page.setViewportSize({ width: viewport.width, height: Math.min(Math.ceil(contentHeight), 6000) });
  await page.screenshot({ path: `/tmp/layout-${name}.png`, fullPage: true });
  await page.setViewportSize(viewport);
}

/**
 * File choosers the page opened, caught from the start: a listener added just before the key
 * press can lose the race with the chooser (playwright turns interception on asynchronously).
 */
function catchFileChoosers(page: Page): () => Promise<FileChooser> {
  const caught: FileChooser[] = [];
  page.on('filechooser', (chooser) => caught.push(chooser));
  return async () => {
    const until = Date.now() + 10_000;
    while (!caught.length && Date.now() < until) await new Promise((r) => setTimeout(r, 50));
    const chooser = caught.shift();
    if (!chooser) throw new Error('no file chooser opened');
    return chooser;
  };
}

/** A viewport-sized shot starting at the top of an element (long pages: the part that matters). */
async function shotFrom(page: Page, locator: Locator, name: string): Promise<void> {
  await locator.evaluate((el) => el.scrollIntoView({ block: 'start' }));
  await page.waitForFunction(() => document.getAnimations().every((a) => a.playState !== 'running'));
  await page.screenshot({ path: `/tmp/layout-${name}.png` });
}

/** How one table's scroll box fits: widths, whether its "scroll sideways" caption shows, row heights. */
interface TableFit {
  scrollWidth: number;
  clientWidth: number;
  hintVisible: boolean;
  hasHint: boolean;
  rowHeights: number[];
  /** Header text and width of each column (for LAYOUT_DEBUG). */
  columns: string;
}

async function tableFit(box: Locator): Promise<TableFit> {
  return box.evaluate((el) => {
    const hint = el.querySelector(':scope > .table-scroll-hint') as HTMLElement | null;
    const rows = Array.from(el.querySelectorAll('tbody tr, tr.mat-mdc-row')).filter(
      (r) => !r.classList.contains('detail-row'),
    ) as HTMLElement[];
    return {
      scrollWidth: el.scrollWidth,
      clientWidth: el.clientWidth,
      hasHint: hint !== null,
      hintVisible: hint !== null && getComputedStyle(hint).display !== 'none' && hint.getBoundingClientRect().height > 0,
      rowHeights: [...new Set(rows.map((r) => Math.round(r.getBoundingClientRect().height)))],
      columns: Array.from(el.querySelectorAll('thead tr:first-child th'))
        .map((th) => `${(th.textContent ?? '').trim().slice(0, 12)}=${Math.round(th.getBoundingClientRect().width)}`)
        .join(' '),
    };
  });
}

/** At 1440 px the table fits its box outright: nothing to scroll, no caption. */
function expectFits(fit: TableFit, what: string): void {
  expectNoClipping(fit, what);
  expect({ what, overflow: Math.max(0, fit.scrollWidth - fit.clientWidth - 1) }).toEqual({ what, overflow: 0 });
}

/** No clipping: the table fits its box, or the box scrolls sideways and says so. */
function expectNoClipping(fit: TableFit, what: string): void {
  if (process.env.LAYOUT_DEBUG) console.log(what, fit.scrollWidth, fit.clientWidth, fit.columns);
  const fits = fit.scrollWidth <= fit.clientWidth + 1;
  expect({ what, ok: fits || fit.hintVisible }).toEqual({ what, ok: true });
  // The caption shows only while the table overflows.
  if (fits) expect({ what, hintVisible: fit.hintVisible }).toEqual({ what, hintVisible: false });
}

/** The page's own content pane never scrolls sideways: only the table boxes do. */
async function expectPageNotWider(page: Page): Promise<void> {
  const overflow = await page.evaluate(() => {
    const pane = document.querySelector('mat-sidenav-content') ?? document.documentElement;
    return pane.scrollWidth - pane.clientWidth;
  });
  expect(overflow).toBeLessThanOrEqual(1);
}

async function openProposal(page: Page, title: string): Promise<string> {
  await page.goto('/proposals');
  await page.getByRole('heading', { name: 'Proposals', level: 1 }).waitFor();
  await page.getByRole('link', { name: title }).first().click();
  await page.waitForURL(/\/proposals\/\d+\//);
  return page.url().replace(/\/[a-z]+$/, '');
}

describe('tables fit the screen', () => {
  it('targets, plans and network fit 1440 px: numbers right-aligned, rows of one height; at phone width they scroll with the hint', async () => {
    const { context, page } = await newPage(browser);
    try {
      await page.setViewportSize(DESKTOP);
      await signIn(page, 'proposer@halcyon.example');
      const base = await openProposal(page, 'Lantern cluster rotation survey');

      // Targets.
      await page.goto(`${base}/targets`);
      const targets = page.locator('.table-scroll', { has: page.getByTestId('targets-table') });
      await targets.waitFor();
      const targetsFit = await tableFit(targets);
      expectFits(targetsFit, 'targets at 1440');
      expect(targetsFit.hasHint).toBe(true);
      expect(targetsFit.rowHeights).toHaveLength(1);
      // Numbers right-aligned, units in the header.
      expect(
        await page
          .getByTestId('targets-table')
          .locator('td.num')
          .first()
          .evaluate((td) => getComputedStyle(td).textAlign),
      ).toBe('end');
      expect(await page.getByTestId('targets-table').locator('th', { hasText: 'Period (d)' }).count()).toBe(1);
      await expectPageNotWider(page);
      await shot(page, 'targets-1440');
      expect(describeViolations(await axeViolations(page))).toBe('');

      // Plans (and the cluster chart above them).
      await page.goto(`${base}/plans`);
      await page.getByTestId('plans-table').waitFor({ timeout: 60_000 });
      await page.waitForLoadState('networkidle');
      const plans = page.locator('.table-scroll', { has: page.getByTestId('plans-table') });
      const plansFit = await tableFit(plans);
      expectFits(plansFit, 'plans at 1440');
      expect(plansFit.rowHeights).toHaveLength(1);
      expectFits(await tableFit(page.locator('.table-scroll', { has: page.getByTestId('request-table') })), 'request at 1440');
      await expectPageNotWider(page);
      await shotFrom(page, page.locator('section.plans'), 'plans-1440');
      await shotFrom(page, page.locator('section.request'), 'plans-top-1440');
      await page.getByTestId('cluster-chart').screenshot({ path: '/tmp/layout-cluster-chart-1440.png' });
      expect(describeViolations(await axeViolations(page))).toBe('');

      // A draft's targets have their edit and delete buttons: still no clipping.
      const draft = await openProposal(page, 'Ages of nearby planet hosts');
      await page.goto(`${draft}/targets`);
      await targets.waitFor();
      const draftFit = await tableFit(targets);
      expectFits(draftFit, 'draft targets at 1440');
      expect(draftFit.rowHeights).toHaveLength(1);
      await shot(page, 'targets-draft-1440');

      // Network.
      await page.goto('/network');
      const nodes = page.locator('.table-scroll', { has: page.getByTestId('nodes-table') });
      await nodes.waitFor();
      const nodesFit = await tableFit(nodes);
      expectFits(nodesFit, 'nodes at 1440');
      expect(nodesFit.rowHeights).toHaveLength(1);
      expectFits(await tableFit(page.locator('.table-scroll', { has: page.getByTestId('sites-table') })), 'sites at 1440');
      await expectPageNotWider(page);
      await shot(page, 'network-1440');
      expect(describeViolations(await axeViolations(page))).toBe('');

      // Phone: the wide tables scroll sideways inside their box, with the caption and the shadow edge.
      await page.setViewportSize(PHONE);
      await page.goto('/network');
      await nodes.waitFor();
      const phoneNodes = await tableFit(nodes);
      expect(phoneNodes.scrollWidth).toBeGreaterThan(phoneNodes.clientWidth);
      expect(phoneNodes.hintVisible).toBe(true);
      expect(phoneNodes.rowHeights).toHaveLength(1);
      await expectPageNotWider(page);
      await page.screenshot({ path: '/tmp/layout-network-phone.png' });

      await page.goto(`${base}/targets`);
      await targets.waitFor();
      const phoneTargets = await tableFit(targets);
      expect(phoneTargets.scrollWidth).toBeGreaterThan(phoneTargets.clientWidth);
      expect(phoneTargets.hintVisible).toBe(true);
      await expectPageNotWider(page);
      await targets.scrollIntoViewIfNeeded();
      await page.screenshot({ path: '/tmp/layout-targets-phone.png' });
      // Scrolled to the far end, the caption stays in view (sticky at the box's start).
      await targets.evaluate((el) => el.scrollTo({ left: el.scrollWidth }));
      const hintBox = await targets.locator('.table-scroll-hint').boundingBox();
      const box = await targets.boundingBox();
      expect(hintBox!.x).toBeGreaterThanOrEqual(box!.x - 1);
      await page.screenshot({ path: '/tmp/layout-targets-phone-scrolled.png' });

      await page.goto(`${base}/plans`);
      await page.getByTestId('plans-table').waitFor({ timeout: 60_000 });
      const phonePlans = await tableFit(plans);
      expect(phonePlans.hintVisible).toBe(true);
      await expectPageNotWider(page);
      await shotFrom(page, plans, 'plans-phone');
      expect(describeViolations(await axeViolations(page))).toBe('');
    } finally {
      await context.close();
    }
  });
});

describe('file buttons and the team warning', () => {
  it('a new draft: the Material file buttons work from the keyboard; inviting a reviewer warns of the conflict', async () => {
    const { context, page } = await newPage(browser);
    try {
      await page.setViewportSize(DESKTOP);
      const nextFileChooser = catchFileChoosers(page);
      await signIn(page, 'proposer@halcyon.example');
      await page.goto('/proposals');
      await page.getByRole('heading', { name: 'Proposals', level: 1 }).waitFor();
      await page.getByRole('button', { name: /New proposal/ }).click();
      const create = page.getByRole('dialog');
      await create.getByLabel('Title').fill(`Layout check ${Date.now()}`);
      await create.getByRole('button', { name: 'Create draft' }).click();
      await page.waitForURL(/\/proposals\/\d+\/overview$/);
      const base = page.url().replace(/\/overview$/, '');

      // Target list: Tab from the mode radios reaches the file button; Enter opens the chooser.
      const csv = path.join(work, 'cluster-members.csv');
      writeFileSync(csv, 'name,ra,dec,magnitude,band,colour,colour_system,age_myr\n');
      await page.goto(`${base}/targets`);
      const chooseCsv = page.getByRole('button', { name: 'Choose a CSV file' });
      await chooseCsv.waitFor();
      expect(await page.getByTestId('csv-input').isVisible()).toBe(false);
      await page.getByRole('radio', { name: 'Add to the list' }).focus();
      await page.keyboard.press('Tab');
      expect(await page.evaluate(() => document.activeElement?.getAttribute('data-testid'))).toBe('choose-csv');
      await page.keyboard.press('Enter');
      const csvChooser = await nextFileChooser();
      await csvChooser.setFiles(csv);
      await page.getByTestId('csv-file-name').getByText('cluster-members.csv').waitFor();
      expect(await page.getByRole('button', { name: 'Choose another CSV file' }).getAttribute('aria-describedby')).toBe('csv-file-name');
      expect(await page.getByRole('button', { name: 'Upload', exact: true }).isEnabled()).toBe(true);
      await page.locator('app-target-upload').screenshot({ path: '/tmp/layout-upload-1440.png' });
      expect(describeViolations(await axeViolations(page))).toBe('');

      // Justification: Space on the focused button opens the chooser.
      const pdf = path.join(work, 'case.pdf');
      writeFileSync(pdf, '%PDF-1.4\n1 0 obj<<>>endobj\ntrailer<<>>\n%%EOF\n');
      await page.goto(`${base}/justification`);
      const choosePdf = page.getByRole('button', { name: 'Choose a PDF' });
      await choosePdf.focus();
      await page.keyboard.press('Space');
      const pdfChooser = await nextFileChooser();
      await pdfChooser.setFiles(pdf);
      await page.getByTestId('pdf-file-name').getByText('case.pdf').waitFor();
      await shot(page, 'justification-1440');
      expect(describeViolations(await axeViolations(page))).toBe('');

      // Team: inviting the demo reviewer warns of the conflict; the invitation is sent all the same.
      await page.goto(`${base}/team`);
      await page.getByLabel("Co-investigator's e-mail").fill('reviewer@halcyon.example');
      await page.getByRole('button', { name: 'Send invitation' }).click();
      const warning = page.getByTestId('reviewer-conflict');
      await warning.waitFor();
      expect(await warning.innerText()).toContain('conflict of interest in the review of cycle');
      expect(await warning.innerText()).toContain("the facility's own rules");
      await page.getByTestId('team-table').getByText('Invited, not yet joined').waitFor();
      await shot(page, 'team-warning-1440');
      expect(describeViolations(await axeViolations(page))).toBe('');
    } finally {
      await context.close();
    }
  });
});

describe('home cards of the roles', () => {
  it('reviewer: the card leads to My reviews, the planner and the network', async () => {
    const { context, page } = await newPage(browser);
    try {
      await page.setViewportSize(DESKTOP);
      await signIn(page, 'reviewer@halcyon.example');
      const card = page.locator('[data-role=reviewer]');
      await card.waitFor();
      expect(await card.getByTestId('upcoming').count()).toBe(0);
      const hrefs = await card.locator('a').evaluateAll((links) => links.map((a) => a.getAttribute('href')));
      expect(hrefs.sort()).toEqual(['/network', '/planner', '/review/my']);
      await shot(page, 'home-reviewer-1440');
      expect(describeViolations(await axeViolations(page))).toBe('');
    } finally {
      await context.close();
    }
  });
});

describe('charts', () => {
  it('planner charts: drawn, for a look at their log axes and legends', async () => {
    const { context, page } = await newPage(browser);
    try {
      await page.setViewportSize(DESKTOP);
      await signIn(page, 'reviewer@halcyon.example');
      await page.goto('/planner');
      await page.getByRole('heading', { name: 'Target planner', level: 1 }).waitFor();
      const charts = page.locator('app-planner-charts');
      await charts.locator('canvas').first().waitFor();
      await page.waitForLoadState('networkidle');
      // The tick values themselves are checked in client/src/app/ui/charts/log-ticks.spec.ts; here they are looked at.
      await charts.screenshot({ path: '/tmp/layout-planner-charts-1440.png' });
    } finally {
      await context.close();
    }
  });
});
