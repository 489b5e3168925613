import { mkdirSync } from 'node:fs';
import path from 'node:path';
import { chromium, type Browser, type BrowserContext, type Locator, type Page } from 'playwright-core';
import { BASE_URL } from './e2e-env';

export const SCREENSHOT_DIR = path.resolve(__dirname, '../../../.data/screenshots');

/** Debian's chromium, headless, with no network chatter of its own (STACK.md pitfall 7). */
export function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    args: [
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
    ],
  });
}

/** A fresh context (own cookies); CSP bypass only so that axe-core can be injected. */
export async function newPage(
  browser: Browser,
  options: { colorScheme?: 'light' | 'dark' } = {},
): Promise<{ context: BrowserContext; page: Page }> {
  const context = await browser.newContext({
    baseURL: BASE_URL,
    bypassCSP: true,
    viewport: { width: 1280, height: 860 },
    colorScheme: options.colorScheme ?? 'light',
  });
  const page = await context.newPage();
  return { context, page };
}

/**
 * Saves a screenshot of the whole page. The app shell scrolls inside its content pane, not
 * the document, so the viewport is made as tall as that pane's content for the shot.
 */
export async function screenshot(page: Page, name: string): Promise<string> {
  mkdirSync(SCREENSHOT_DIR, { recursive: true });
  const file = path.join(SCREENSHOT_DIR, `${name}.png`);
  const viewport = page.viewportSize();
  const contentHeight = await page.evaluate(() =>
    Math.max(
      ...Array.from(document.querySelectorAll('mat-sidenav-content, main, body')).map(
        (e) => e.scrollHeight + (e.getBoundingClientRect().top || 0),
      ),
    ),
  );
  if (viewport && contentHeight > viewport.height)
    await page.setViewportSize({ width: viewport.width, height: Math.min(Math.ceil(contentHeight), 8000) });
  await page.screenshot({ path: file, fullPage: true });
  if (viewport) await page.setViewportSize(viewport);
  return file;
}

/** Saves a screenshot of one part of the page (a chart, a table) at full resolution. */
export async function screenshotOf(locator: Locator, name: string): Promise<string> {
  mkdirSync(SCREENSHOT_DIR, { recursive: true });
  const file = path.join(SCREENSHOT_DIR, `${name}.png`);
  await locator.screenshot({ path: file });
  return file;
}

export interface AxeViolation {
  id: string;
  impact: string | null;
  help: string;
  nodes: { target: string[] }[];
}

/** Runs axe-core (WCAG 2.1 A/AA rules) on the current page and returns its violations. */
export async function axeViolations(page: Page): Promise<AxeViolation[]> {
  await page.addScriptTag({ path: require.resolve('axe-core/axe.min.js') });
  return page.evaluate(async () => {
    const axe = (window as unknown as { axe: { run: (ctx: unknown, opts: unknown) => Promise<{ violations: AxeViolation[] }> } }).axe;
    const result = await axe.run(document, { runOnly: { type: 'tag', values: ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'] } });
    return result.violations.map((v) => ({ id: v.id, impact: v.impact, help: v.help, nodes: v.nodes.map((n) => ({ target: n.target })) }));
  });
}

/** Readable one-line-per-problem summary for assertion messages. */
export function describeViolations(v: AxeViolation[]): string {
  return v.map((x) => `${x.id} (${x.impact}): ${x.help} at ${x.nodes.map((n) => n.target.join(' ')).join(', ')}`).join('\n');
}
