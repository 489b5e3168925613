/**
 * The web process stays responsive while the heaviest requests it accepts are computed: a
 * maximal target-list upload (a 4.9 MB CSV, far more rows than a proposal holds) and a
 * maximal sky-windows request (500 targets × 2 nodes × 366 nights, the cost limit).
 * Tests here never assert a time (DEVELOPERS.md: timings belong to `npm run bench`), so the
 * checks are structural: the sky windows are computed on a worker thread, the upload is read
 * as a stream and stopped at the row limit, and health probes keep being answered while both
 * run (a request computed on the request thread holds the loop for its whole duration, so
 * the probes would queue behind it). The probes' latencies are printed for the record.
 */
import request from 'supertest';
import { MAX_TARGETS_PER_PROPOSAL } from '@spincycle/shared/proposals/target-schemas';
import { SKY_WINDOWS_MAX_COST, SKY_WINDOWS_MAX_TARGETS } from '@spincycle/shared/planning/sky-windows-request';
import { closeSkyWindowsPool, skyWindowsPoolStats } from '../../server/src/features/sky-windows/sky-windows-pool';
import { startHarness, type Harness } from '../support/api-harness';
import { createTestNetwork, CSV_HEADER, csvLine, proposerWithDraft, uploadFile, type TestNetwork } from './support/proposal-kit';

let h: Harness;
let net: TestNetwork;
let yearCycleId: number;

beforeAll(async () => {
  h = await startHarness();
  net = await createTestNetwork(h, 'R');
  // An open call whose campaign is the longest there is (366 nights).
  yearCycleId = (await net.createCycle({ campaignNights: 366 })).id;
});
afterAll(async () => {
  await closeSkyWindowsPool();
  await net.cleanUp();
  await h.close();
});

/** GET /api/health once; its latency as seen by the client, in milliseconds. */
async function probeHealth(): Promise<number> {
  const t0 = performance.now();
  const res = await request(h.created.app).get('/api/health');
  if (res.status !== 200) throw new Error(`health answered ${res.status}`);
  return performance.now() - t0;
}

it('GET /api/health keeps answering while a maximal CSV upload and a maximal sky-windows request run (the sky windows on a worker thread)', async () => {
  const { browser, proposal } = await proposerWithDraft(h, net.cycleId);
  // 4.9 MB: MAX_TARGETS_PER_PROPOSAL valid rows, then many more (notes fill the rows).
  const notes = 'n'.repeat(120);
  const lines: string[] = [CSV_HEADER];
  let bytes = CSV_HEADER.length;
  for (let i = 1; bytes < 4.9 * 1024 * 1024; i++) {
    const line = csvLine(`Star L-${i}`) + notes;
    lines.push(line);
    bytes += line.length + 1;
  }
  expect(lines.length - 1).toBeGreaterThan(10 * MAX_TARGETS_PER_PROPOSAL);
  const csv = Buffer.from(lines.join('\n'));

  const targets = Array.from({ length: SKY_WINDOWS_MAX_TARGETS }, (_, i) => ({ ra: (i * 0.72) % 360, dec: -80 + (i % 160) }));
  const skyBody = { cycleId: yearCycleId, nodeIds: net.nodeIds.slice(0, 2), targets, includeNights: false };
  expect(SKY_WINDOWS_MAX_TARGETS * 2 * 366).toBe(SKY_WINDOWS_MAX_COST);
  // Warm up the sky-windows worker thread (its start is not what is measured), and the routes.
  expect((await browser.post('/api/sky-windows', { ...skyBody, targets: targets.slice(0, 10) })).status).toBe(200);
  await probeHealth();

  const jobsBefore = skyWindowsPoolStats().completedJobs;
  let running = true;
  const heavy = Promise.all([
    uploadFile(browser, 'post', `/api/proposals/${proposal.id}/targets/upload`, csv, 'many.csv'),
    browser.post('/api/sky-windows', skyBody),
  ]).finally(() => {
    running = false;
  });
  const latencies: number[] = [];
  while (running) {
    latencies.push(await probeHealth());
    await new Promise((resolve) => setTimeout(resolve, 10));
  }
  const [uploaded, windows] = await heavy;

  expect(uploaded.status).toBe(400);
  expect(uploaded.body).toMatchObject({
    code: 'too_many_targets',
    message: expect.stringContaining(`at most ${MAX_TARGETS_PER_PROPOSAL}`),
  });
  expect(windows.status).toBe(200);
  expect(windows.body.nodes).toHaveLength(2);
  expect(windows.body.nodes[0].report.targets).toHaveLength(SKY_WINDOWS_MAX_TARGETS);
  // The maximal request went to the worker thread, not the request thread…
  expect(skyWindowsPoolStats().completedJobs).toBe(jobsBefore + 1);
  // …and the probes kept being answered while the heavy requests ran.
  expect(latencies.length).toBeGreaterThanOrEqual(3);
  console.log(`health probes during the heavy requests: ${latencies.length}, slowest ${Math.max(...latencies).toFixed(0)} ms`);
}, 60_000);
