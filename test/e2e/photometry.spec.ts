/**
 * Returned photometry on the demo data (database/seeds/07-photometry.ts: the demo proposer is a
 * co-investigator of the round-0 cluster program, whose targets but the slowest rotator have
 * light curves, already analysed): the proposer opens the program's light curves, uploads the
 * missing target's curve (made here with a seed), watches the analysis's progress bar to the
 * end, opens a measured target's folded curve and periodogram, looks at the cluster's
 * period–colour diagram and exports the table. Each page is checked with axe-core and
 * photographed (.data/screenshots/).
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import type { ProgramPhotometry } from '@spincycle/shared/photometry/photometry';
import { seededRandom } from '@spincycle/shared/science/seeded-random';
import { axeViolations, describeViolations, launchBrowser, newPage, screenshot } from './support/browser';
import { signIn } from './support/session';

let browser: Browser;
let work: string;

beforeAll(async () => {
  browser = await launchBrowser();
  work = mkdtempSync(path.join(tmpdir(), 'spincycle-e2e-photometry-'));
});
afterAll(async () => {
  await browser?.close();
  rmSync(work, { recursive: true, force: true });
});

async function expectAxeClean(page: Page): Promise<void> {
  expect(describeViolations(await axeViolations(page))).toBe('');
}

/** A light curve of `name`: 12 clear nights of 6 hours from MJD `start`, a point every 10 minutes, period 7 d, 6 mmag. */
function lightCurve(name: string, start: number): string {
  const rnd = seededRandom(1407);
  const lines = ['target,mjd,mag,error'];
  for (let night = 0; night < 24; night++) {
    for (let t = start + night + 0.05; t < start + night + 0.3; t += 10 / 1440) {
      const mag = 12.2 + 0.006 * Math.sin((2 * Math.PI * t) / 7) + rnd.normal(0, 0.003);
      lines.push(`${name},${t.toFixed(6)},${mag.toFixed(5)},0.003`);
    }
  }
  return lines.join('\n') + '\n';
}

describe('returned photometry', () => {
  it('a proposer uploads a light curve, watches the analysis, opens a folded curve and the cluster diagram, and exports the table', async () => {
    const { context, page } = await newPage(browser);
    try {
      await page.setViewportSize({ width: 1440, height: 1000 });
      await signIn(page, 'proposer@halcyon.example');
      await page.getByRole('link', { name: 'Proposals' }).first().click();
      const program = page
        .locator('tr')
        .filter({ has: page.getByText('Awarded', { exact: true }) })
        .first();
      await program.waitFor();
      await program.getByRole('link').first().click();
      await page.getByRole('tab', { name: 'Light curves' }).click();
      await page.getByTestId('photometry-table').waitFor();
      const proposalId = /\/proposals\/(\d+)\//.exec(page.url())?.[1];
      expect(proposalId).toMatch(/^\d+$/);
      await expectAxeClean(page);
      await screenshot(page, 'photometry-program');

      // The target without a light curve, from the page's own API.
      const before = (await (await context.request.get(`/api/proposals/${proposalId}/photometry`)).json()) as ProgramPhotometry;
      const missing = before.targets.find((t) => t.points === null)!;
      expect(missing).toBeTruthy();
      const file = path.join(work, 'missing-target.csv');
      writeFileSync(file, lightCurve(missing.targetName, 61000));
      await page.getByTestId('light-curve-files-input').setInputFiles(file);
      await page.getByTestId('light-curve-upload-button').click();
      await page.getByTestId('photometry-run-progress').waitFor();
      await screenshot(page, 'photometry-analysing');
      await page
        .getByTestId('photometry-run-state')
        .filter({ hasText: /Last analysed/ })
        .waitFor({ timeout: 60_000 });
      await page.getByTestId(`photometry-row-${missing.targetId}`).getByTestId('verdict-chip').waitFor();
      const after = (await (await context.request.get(`/api/proposals/${proposalId}/photometry`)).json()) as ProgramPhotometry;
      const uploaded = after.targets.find((t) => t.targetId === missing.targetId)!;
      expect(uploaded.points).toBe(readFileSync(file, 'utf8').trim().split('\n').length - 1);
      expect(uploaded.verdict).not.toBeNull();

      // The cluster's period–colour diagram.
      const cluster = page.getByTestId('cluster-age-card');
      await cluster.scrollIntoViewIfNeeded();
      await cluster.getByTestId('cluster-age-chart').waitFor();
      await screenshot(page, 'photometry-cluster');

      // The table, exported.
      const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('photometry-export').click()]);
      const csv = readFileSync((await download.path())!, 'utf8');
      expect(csv.split('\n')[0]).toMatch(/^target,colour,colour_system,points,/);
      expect(csv.trim().split('\n')).toHaveLength(after.targets.length + 1);

      // A measured target: its folded curve and periodogram.
      const measured = after.targets.find((t) => t.verdict === 'measured')!;
      expect(measured).toBeTruthy();
      await page.getByTestId(`photometry-row-link-${measured.targetId}`).click();
      await page.getByTestId('folded-chart').waitFor();
      await page.getByTestId('periodogram-chart').waitFor();
      expect(await page.getByTestId('target-verdict').innerText()).toMatch(/Measured/);
      await page.waitForTimeout(500);
      await expectAxeClean(page);
      await screenshot(page, 'photometry-target');
      await page.getByTestId('folded-chart').scrollIntoViewIfNeeded();
      await screenshot(page, 'photometry-target-folded');
    } finally {
      await context.close();
    }
  });
});
