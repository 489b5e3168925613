/**
 * The sky-window counts agree across the dialog's summary and the plan's own verdict, on a
 * target built so that they differ: a young M dwarf (short period: several visits a night)
 * placed where, for part of the campaign, its nightly window is too short for all of them. The
 * summary counts the nights it is observable at all; the plan counts the nights that can hold
 * its visits (docs/science.md#sky-counts). Each is shown under its own words, and each equals
 * what the API computed for it — one value per count, the same on every screen.
 */
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { Browser } from 'playwright-core';
import type { TelescopeNode } from '../../shared/src/facility/facility-types';
import { computePlanRows } from '../../server/src/features/proposals/plans/plan-computation';
import type { StoredTarget } from '../../server/src/features/proposals/targets/target-repository';
import { axeViolations, describeViolations, launchBrowser, newPage, screenshotOf } from './support/browser';
import { signIn } from './support/session';

let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(() => browser?.close());

const NODE = 'KRG-50';

/** The candidate star at right ascension `raDeg`: young, cool, moderately bright. */
function candidate(raDeg: number, decDeg: number): StoredTarget {
  return {
    id: 1,
    name: 'Star S-1',
    raDeg,
    decDeg,
    magnitude: 12,
    magnitudeBand: 'G',
    colour: 2.4,
    colourSystem: 'BPRP',
    reddeningEbv: null,
    ageMyr: 150,
    ageUncertaintyMyr: 30,
    periodPrecisionDays: null,
    periodDays: null,
    periodUncertaintyDays: null,
  } as unknown as StoredTarget;
}

describe('sky-window counts', () => {
  it('the dialog’s observable nights and the plan’s nights that hold its visits: each the API’s value, in its own words', async () => {
    const { context, page } = await newPage(browser);
    const work = mkdtempSync(path.join(tmpdir(), 'sky-counts-'));
    try {
      await page.setViewportSize({ width: 1440, height: 1000 });
      await signIn(page, 'proposer@halcyon.example');
      await page.goto('/proposals');
      await page.getByRole('button', { name: /New proposal/ }).click();
      const create = page.getByRole('dialog');
      await create.getByLabel('Title').fill(`Sky counts ${Date.now()}`);
      await create.getByRole('button', { name: 'Create draft' }).click();
      await page.waitForURL(/\/proposals\/\d+\/overview$/);
      const proposalId = Number(/\/proposals\/(\d+)\//.exec(page.url())![1]);
      await page.getByRole('checkbox', { name: NODE }).check();
      await page.getByText(/Saved \d\d:\d\d/).waitFor();

      // Build the case: over right ascensions, the star whose observable nights exceed most the
      // nights that can hold its visits (the same computation the plan worker runs).
      const proposal = (await (await context.request.get(`/api/proposals/${proposalId}`)).json()) as { cycle: { id: number } };
      const cycle = (await (await context.request.get(`/api/cycles/${proposal.cycle.id}`)).json()) as {
        campaignStart: string;
        campaignEnd: string;
      };
      const nodes = (await (await context.request.get('/api/nodes')).json()) as TelescopeNode[];
      const node = nodes.find((n) => n.code === NODE)!;
      let best: { raDeg: number; decDeg: number; observable: number; holding: number } | null = null;
      for (const dec of [-30, -15, 0, 15]) {
        for (let ra = 0; ra < 360; ra += 15) {
          const [row] = await computePlanRows({
            campaign: { firstNight: cycle.campaignStart, lastNight: cycle.campaignEnd },
            nodes: [node],
            targets: [candidate(ra, dec)],
            completeness: 0.9,
          });
          const holding = Number(/^(\d+) of/.exec(row.result?.skyVerdict ?? '')?.[1] ?? NaN);
          const observable = row.result?.usableNights ?? NaN;
          if (holding > 0 && observable - holding > (best ? best.observable - best.holding : 0))
            best = { raDeg: ra, decDeg: dec, observable, holding };
        }
      }
      expect(best).not.toBeNull();
      expect(best!.observable - best!.holding).toBeGreaterThanOrEqual(2);

      const hours = Math.floor(best!.raDeg / 15);
      const csv = path.join(work, 'sky-counts.csv');
      writeFileSync(
        csv,
        'name,ra,dec,magnitude,band,colour,colour_system,ebv,age_myr,age_err_myr,period_precision_d,notes\n' +
          `Star S-1,${String(hours).padStart(2, '0')}:00:00,${best!.decDeg},12,G,2.4,BPRP,,150,30,,built so that the counts differ\n`,
      );
      await page.getByRole('tab', { name: 'Targets' }).click();
      await page.getByTestId('csv-input').setInputFiles(csv);
      await page.getByRole('button', { name: 'Upload', exact: true }).click();
      await page.getByText('Star S-1').first().waitFor();

      await page.getByRole('tab', { name: 'Plans' }).click();
      await page.getByTestId('plans-table').waitFor({ timeout: 60_000 });
      await page.getByTestId('plan-progress').waitFor({ state: 'detached', timeout: 60_000 });
      await page.getByRole('button', { name: `Sky window of Star S-1 from ${NODE}` }).click();
      const dialog = page.getByRole('dialog');
      const summary = dialog.getByTestId('sky-verdict');
      await summary.waitFor();
      const planLine = dialog.locator('.plan-verdict');
      await planLine.waitFor();

      const summaryText = (await summary.textContent())!;
      const planText = (await planLine.textContent())!;
      const observable = Number(/observable on (\d+) of (\d+) nights/.exec(summaryText)?.[1]);
      const holding = Number(new RegExp(`Target plan on ${NODE}: (\\d+) of (\\d+) nights can hold the`).exec(planText)?.[1]);
      // Each count the API's own value, under its own words; here they differ, as built.
      expect(observable).toBe(best!.observable);
      expect(holding).toBe(best!.holding);
      expect(observable).toBeGreaterThan(holding);
      expect(planText).not.toMatch(/observable on/);
      const targets = (await (await context.request.get(`/api/proposals/${proposalId}/targets`)).json()) as
        { targets?: { id: number }[] } | { id: number }[];
      const targetId = (Array.isArray(targets) ? targets : targets.targets!)[0].id;
      const report = (await (
        await context.request.get(`/api/proposals/${proposalId}/targets/${targetId}/sky?nodeId=${node.id}`)
      ).json()) as {
        targets: { summary: { usableNights: number } }[];
      };
      expect(report.targets[0].summary.usableNights).toBe(observable);
      const plans = (await (await context.request.get(`/api/proposals/${proposalId}/plans`)).json()) as {
        plans: { skyVerdict: string; usableNights: number }[];
      };
      expect(plans.plans[0].usableNights).toBe(observable);
      expect(plans.plans[0].skyVerdict).toMatch(new RegExp(`^${holding} of \\d+ nights can hold the`));
      await screenshotOf(dialog, 'sky-counts-dialog');
      expect(describeViolations(await axeViolations(page))).toBe('');
    } finally {
      await context.close();
    }
  });
});
