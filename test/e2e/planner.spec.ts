import { copyFileSync } from 'node:fs';
import type { Browser, Page } from 'playwright-core';
import { type AxeViolation, axeViolations, describeViolations, launchBrowser, newPage, screenshot, screenshotOf } from './support/browser';
import { signIn } from './support/session';

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(() => browser?.close());

/** Where the planner's review screenshots go (besides the suite's own folder). */
const REVIEW_SHOTS = process.env.PLANNER_SHOTS_DIR ?? '/tmp';

/**
 * Screenshots for a person to look at: the whole page, and the first screens one viewport at a
 * time (`name-1.png`, `name-2.png`...), scrolled in the app shell's content pane.
 */
async function reviewShot(page: Page, name: string, screens = 3): Promise<void> {
  const scroller = page.locator('mat-sidenav-content');
  await scroller.evaluate((el) => el.scrollTo(0, 0));
  const file = await screenshot(page, name);
  copyFileSync(file, `${REVIEW_SHOTS}/${name}.png`);
  const height = page.viewportSize()?.height ?? 900;
  for (let i = 0; i < screens; i++) {
    await scroller.evaluate((el, top) => el.scrollTo(0, top), i * (height - 64));
    await page.screenshot({ path: `${REVIEW_SHOTS}/${name}-${i + 1}.png` });
  }
  await scroller.evaluate((el) => el.scrollTo(0, 0));
}

/**
 * The axe violations inside the planner page. At phone width the app shell's account button
 * shows only its icon and has no accessible name (core/layout, outside this page): that one is
 * left to the shell's own test.
 */
async function plannerViolations(page: Page): Promise<AxeViolation[]> {
  const all = await axeViolations(page);
  const inside: AxeViolation[] = [];
  for (const v of all) {
    const nodes = [];
    for (const node of v.nodes) {
      const inPage = await page.evaluate(
        (selector) => !!document.querySelector(selector)?.closest('app-target-planner'),
        node.target.join(' '),
      );
      if (inPage) nodes.push(node);
    }
    if (nodes.length) inside.push({ ...v, nodes });
  }
  return inside;
}

async function openPlanner(page: Page): Promise<void> {
  await signIn(page, 'reviewer@halcyon.example');
  await page.getByRole('link', { name: 'Target planner' }).first().click();
  await page.getByRole('heading', { name: 'Target planner', level: 1 }).waitFor();
  await page.getByTestId('summary-figures').waitFor();
}

const DECISION_LABELS = [
  'Expected period',
  'Spot amplitude',
  'Per-visit precision',
  'Visits',
  'Cadence',
  'Baseline',
  'Node-hours',
  'Fee',
  'Completeness',
];

describe('target planner', () => {
  it('puts the decision numbers first, explains each on demand, recomputes on input, and draws sky windows per node', async () => {
    const { context, page } = await newPage(browser);
    try {
      await page.setViewportSize({ width: 1440, height: 900 });
      await openPlanner(page);

      // The summary: the verdict and the numbers a proposer decides on, money as money.
      const summary = page.getByTestId('headline');
      await summary
        .getByText(/Feasible on|Not feasible on/)
        .first()
        .waitFor();
      const figures = page.getByTestId('summary-figures');
      for (const label of DECISION_LABELS) await figures.getByText(label, { exact: true }).waitFor();
      const fee = (await figures.locator('[data-key=fee] .num').innerText()).trim();
      expect(fee).toMatch(/^[€$£]\s?[\d,]+\.\d{2}$|^[\d,.]+\s?[€$£]$/);
      const cadence = await figures.locator('[data-key=cadence]').innerText();
      expect(cadence).toMatch(/Every (night|\d+ nights)/);
      expect(cadence).toMatch(/\d+ visits? per night · sample interval [\d.]+ d/);
      const mainText = await page.locator('main').innerText();
      expect(mainText).not.toMatch(/NaN|minor units|from memory|our choice|no source|maxExposure/);

      // Changing the age changes the expected period shown.
      const period = () => figures.locator('[data-key=period] .num').innerText();
      const before = await period();
      await page.getByLabel('Age', { exact: true }).fill('3000');
      await page.waitForFunction(
        (prev) => document.querySelector('[data-testid=summary-figures] [data-key=period] .num')?.textContent?.trim() !== prev,
        before,
      );
      expect(await period()).not.toEqual(before);

      // The explanation of a number opens from the keyboard.
      const periodPanel = page.locator('mat-expansion-panel[data-key=periodDays]');
      await periodPanel.locator('mat-expansion-panel-header').focus();
      await page.keyboard.press('Enter');
      await periodPanel.getByText('Formula and source').waitFor();
      await periodPanel.getByText('Published relation').waitFor();
      expect(await periodPanel.locator('.source').innerText()).toMatch(/\(\d{4}\)/);

      // Sky windows: a position and the open demo cycle.
      await page.getByLabel('Right ascension').fill('10:52:48');
      await page.getByLabel('Declination').fill('+31:36:00');
      await page.getByTestId('cycle-select').click();
      await page.getByRole('option', { name: /Spin-down monitoring/ }).click();
      await page.locator('app-sky-window-chart').first().waitFor();
      await page
        .getByText(/observable on \d+ of \d+ nights|\d+ of \d+ nights can hold the/)
        .first()
        .waitFor();
      await page
        .getByTestId('summary-sky')
        .getByText(/Sky window from/)
        .waitFor();
      await page.waitForLoadState('networkidle');
      await reviewShot(page, 'planner-1440');
      await screenshotOf(page.getByTestId('headline'), 'planner-summary');
      await screenshotOf(page.locator('section[aria-labelledby="plan-heading"]'), 'planner-plan');
      expect(describeViolations(await axeViolations(page))).toBe('');

      // A phone: the summary comes first, above the inputs.
      await page.setViewportSize({ width: 390, height: 844 });
      await page.waitForTimeout(300);
      const summaryBox = await page.getByTestId('headline').boundingBox();
      const inputsBox = await page.locator('app-planner-inputs').boundingBox();
      expect(summaryBox!.y).toBeLessThan(inputsBox!.y);
      await reviewShot(page, 'planner-phone', 5);
      expect(describeViolations(await plannerViolations(page))).toBe('');
    } finally {
      await context.close();
    }
  });

  it('shows every bad field at once, in the numbers the user typed', async () => {
    const { context, page } = await newPage(browser);
    try {
      await page.setViewportSize({ width: 1440, height: 900 });
      await openPlanner(page);
      await page.getByTestId('colour-input').fill('5');
      await page.getByTestId('age-input').fill('-5');
      await page.getByTestId('magnitude-input').fill('30');
      await page.getByTestId('completeness-input').fill('30');
      await page.getByTestId('ra-input').fill('25h');
      await page.getByTestId('dec-input').fill('95.2');
      await page.getByTestId('dec-input').blur();

      const expected: [string, RegExp][] = [
        ['colour-error', /between 0\.56 and 3\.35 mag \(you typed 5\)/],
        ['age-error', /above 0 Myr \(you typed -5\)/],
        ['magnitude-error', /between −2 and 25 mag \(you typed 30\)/],
        ['completeness-error', /between 50 and 99 % \(you typed 30\)/],
        ['ra-error', /between 0 and 24 h .*\(you typed 25h\)/],
        ['dec-error', /between −90° and 90° \(you typed 95\.2\)/],
      ];
      for (const [testId, text] of expected) await page.getByTestId(testId).getByText(text).waitFor();
      await page.getByTestId('headline').getByText('No plan yet').waitFor();
      expect(await page.getByTestId('headline').innerText()).toMatch(
        /Fix the 6 fields marked in red: Colour, Age, Magnitude, Completeness, Right ascension, Declination\./,
      );
      // The colour system stays beside the value, with a warning when the value belongs to the other system.
      await page.getByTestId('colour-system').getByText('B−V').click();
      await page.getByTestId('colour-input').fill('2.5');
      await page
        .getByTestId('colour-warning')
        .getByText(/outside the F5V–M5V dwarfs .* plausible BP−RP/)
        .waitFor();
      await reviewShot(page, 'planner-errors-1440');
      expect(describeViolations(await axeViolations(page))).toBe('');
    } finally {
      await context.close();
    }
  });

  it('an old, faint star: the summary cannot be missed as not feasible or costly, with the ways out', async () => {
    const { context, page } = await newPage(browser);
    try {
      await page.setViewportSize({ width: 1440, height: 900 });
      await openPlanner(page);
      await page.getByTestId('age-input').fill('4000');
      await page.getByTestId('colour-input').fill('0.8');
      await page.getByTestId('magnitude-input').fill('16');
      const verdict = page.getByTestId('verdict');
      await verdict.getByText(/Not feasible on|only at a high cost/).waitFor();
      const headline = page.getByTestId('headline');
      expect(await headline.getAttribute('data-tone')).toMatch(/infeasible|warning/);
      await page.getByTestId('summary-way-out').waitFor();
      const ways = await page.getByTestId('summary-way-out').locator('li').allInnerTexts();
      expect(ways.length).toBeGreaterThan(0);
      expect(new Set(ways).size).toBe(ways.length);
      await reviewShot(page, 'planner-infeasible-1440');
      expect(describeViolations(await axeViolations(page))).toBe('');
    } finally {
      await context.close();
    }
  });
});
