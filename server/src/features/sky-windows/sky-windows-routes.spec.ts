import { Body, Equator, Horizon, Observer } from 'astronomy-engine';
import { SKY_WINDOWS_MAX_COST } from '@spincycle/shared/planning/sky-windows-request';
import { skyLimitsForNode } from '@spincycle/shared/sky/index';
import { signedIn, startHarness, type Harness } from '../../../../test/support/api-harness';
import { computeSkyWindowsJob } from './sky-windows-compute';
import { closeSkyWindowsPool, skyWindowsPoolStats } from './sky-windows-pool';

let h: Harness;
let cycleId: number;
let upcomingCycleId: number;
let yearCycleId: number;
let nodeId: number;
let otherNodeIds: number[];
let siteId: number;
const tag = `W${Date.now().toString(36).toUpperCase()}`;

beforeAll(async () => {
  h = await startHarness();
  const db = h.created.ctx.db;
  [{ id: siteId }] = await db('sites')
    .insert({
      code: `${tag}S`,
      name: 'Window Hill',
      latitude_deg: -29.25,
      longitude_deg: -70.73,
      elevation_m: 2300,
      time_zone: 'America/Santiago',
      sky_brightness_mag_per_arcsec2: 21.7,
    })
    .returning('id');
  [{ id: nodeId }] = await db('nodes')
    .insert({
      code: `${tag}N`,
      name: 'Window 60',
      site_id: siteId,
      aperture_m: 0.6,
      obstruction_fraction: 0.4,
      throughput: 0.5,
      band: 'R',
      read_noise_e: 8,
      dark_current_e_per_s: 0.02,
      gain_e_per_adu: 1.2,
      saturation_e: 70000,
      pixel_scale_arcsec: 0.9,
      seeing_fwhm_arcsec: 1.5,
      systematic_floor_mmag: 1,
      scintillation_model: 'osborn2015',
      overhead_seconds: 50,
      min_exposure_seconds: 1,
      max_exposure_seconds: 300,
      altitude_limit_deg: 30,
      weather_loss_fraction: 0.2,
      rate_minor_per_hour: 5000,
      currency: 'eur',
    })
    .returning('id');
  const twin = await db('nodes').where({ id: nodeId }).first();
  delete twin.id;
  delete twin.created_at;
  delete twin.updated_at;
  otherNodeIds = (
    await db('nodes')
      .insert([
        { ...twin, code: `${tag}N2`, name: 'Window 60 B' },
        { ...twin, code: `${tag}N3`, name: 'Window 60 C' },
      ])
      .returning('id')
  ).map((r: { id: number }) => r.id);
  // Call open now (proposers see it), campaign in June 2030.
  [{ id: cycleId }] = await db('cycles')
    .insert({
      code: `${tag}C`,
      title: 'Window cycle',
      call_opens_at: new Date(Date.now() - 86400_000),
      call_closes_at: new Date('2030-02-01'),
      campaign_start: '2030-06-01',
      campaign_end: '2030-06-30',
    })
    .returning('id');
  // Not announced yet: its call opens in 2031.
  [{ id: upcomingCycleId }] = await db('cycles')
    .insert({
      code: `${tag}U`,
      title: 'Unannounced cycle',
      call_opens_at: new Date('2031-01-01'),
      call_closes_at: new Date('2031-02-01'),
      campaign_start: '2031-06-01',
      campaign_end: '2031-06-30',
    })
    .returning('id');
  // Open call, the longest campaign (366 nights).
  [{ id: yearCycleId }] = await db('cycles')
    .insert({
      code: `${tag}Y`,
      title: 'Year cycle',
      call_opens_at: new Date(Date.now() - 86400_000),
      call_closes_at: new Date('2030-02-01'),
      campaign_start: '2030-03-01',
      campaign_end: '2031-03-01',
    })
    .returning('id');
});
afterAll(async () => {
  const db = h.created.ctx.db;
  await closeSkyWindowsPool();
  await db('cycles').whereIn('id', [cycleId, upcomingCycleId, yearCycleId]).del();
  await db('nodes')
    .whereIn('id', [nodeId, ...otherNodeIds])
    .del();
  await db('sites').where({ id: siteId }).del();
  await h.close();
});

describe('POST /api/sky-windows', () => {
  it('returns per-night windows from the node’s site with its own limits; a target at Dec −60° is up every June night in the south', async () => {
    const { browser } = await signedIn(h);
    const res = await browser.post('/api/sky-windows', {
      cycleId,
      nodeIds: [nodeId],
      targets: [
        { name: 'Star S-1', ra: '15:30:00', dec: '-60:00:00' },
        { name: 'Star N-1', ra: 120, dec: 70 },
      ],
    });
    expect(res.status).toBe(200);
    const node = res.body.nodes[0];
    expect(node).toMatchObject({ nodeId, nodeCode: `${tag}N`, siteName: 'Window Hill', weatherLossFraction: 0.2 });
    expect(node.report.limits.altitudeLimitDeg).toBe(30);
    expect(node.report.nights).toHaveLength(30);
    const [south, north] = node.report.targets;
    expect(south.raDeg).toBeCloseTo(232.5, 9);
    expect(south.summary.usableNights).toBe(30);
    // Dec +70° never climbs above 30° at latitude −29.25° (max altitude 90 − |φ − δ| = −9.25°).
    expect(north.summary.usableNights).toBe(0);
    // Cross-check one night's mid-darkness altitude with astronomy-engine's Horizon (outside our fast path).
    const night = south.nights[10];
    const dark = node.report.nights[10];
    const mid = new Date((Date.parse(dark.darkStartUtc) + Date.parse(dark.darkEndUtc)) / 2);
    const observer = new Observer(-29.25, -70.73, 2300);
    // astronomy-engine works in of-date coordinates; at this precision (0.1°) J2000 is close enough.
    const hor = Horizon(mid, observer, 232.5 / 15, -60, 'normal');
    expect(night.altitudeAtMidDarkDeg).toBeCloseTo(hor.altitude, 0);
  });

  it('gives each target night the Moon’s altitude (what the planner’s moonlit sky needs), at the middle of the longest usable interval', async () => {
    const { browser } = await signedIn(h);
    const res = await browser.post('/api/sky-windows', {
      cycleId,
      nodeIds: [nodeId],
      targets: [{ name: 'Star S-1', ra: '15:30:00', dec: '-60:00:00' }],
    });
    expect(res.status).toBe(200);
    const nights: { intervals: { startUtc: string; endUtc: string }[]; moonAltitudeDeg: number }[] =
      res.body.nodes[0].report.targets[0].nights;
    expect(nights).toHaveLength(30);
    const observer = new Observer(-29.25, -70.73, 2300);
    for (const night of nights) {
      expect(typeof night.moonAltitudeDeg).toBe('number');
      expect(night.moonAltitudeDeg).toBeGreaterThanOrEqual(-90);
      expect(night.moonAltitudeDeg).toBeLessThanOrEqual(90);
      // Rounded like the other altitudes of the report (0.01°).
      expect(Number(night.moonAltitudeDeg.toFixed(2))).toBe(night.moonAltitudeDeg);
    }
    // Cross-check one night with astronomy-engine (topocentric Moon, no refraction).
    const night = nights[12];
    const longest = night.intervals.reduce((a, b) =>
      Date.parse(b.endUtc) - Date.parse(b.startUtc) > Date.parse(a.endUtc) - Date.parse(a.startUtc) ? b : a,
    );
    const mid = new Date((Date.parse(longest.startUtc) + Date.parse(longest.endUtc)) / 2);
    const moon = Equator(Body.Moon, mid, observer, true, true);
    expect(Math.abs(Horizon(mid, observer, moon.ra, moon.dec).altitude - night.moonAltitudeDeg)).toBeLessThan(0.1);
  });

  it('reports every bad coordinate by row and field, and computes nothing', async () => {
    const { browser } = await signedIn(h);
    const res = await browser.post('/api/sky-windows', {
      cycleId,
      nodeIds: [nodeId],
      targets: [
        { ra: 10, dec: 10 },
        { ra: 400, dec: 0 },
        { ra: '12:30', dec: '95.2' },
        { ra: 'abc', dec: '1' },
      ],
    });
    expect(res.status).toBe(400);
    expect(res.body.message).toMatch(/^row 2, ra: /);
    expect(Object.keys(res.body.fieldErrors).sort()).toEqual(['targets.1.ra', 'targets.2.dec', 'targets.3.ra']);
    expect(res.body.fieldErrors['targets.2.dec'][0]).toMatch(/row 3, dec: .*95\.2/);
  });

  it('validates the request: unknown cycle or node, empty lists, too many targets with nights', async () => {
    const { browser } = await signedIn(h);
    const one = [{ ra: 1, dec: 1 }];
    expect((await browser.post('/api/sky-windows', { cycleId: 99999999, nodeIds: [nodeId], targets: one })).body).toEqual({
      code: 'cycle_not_found',
      message: 'No cycle 99999999',
    });
    expect((await browser.post('/api/sky-windows', { cycleId, nodeIds: [99999999], targets: one })).body.fieldErrors.nodeIds).toBeDefined();
    expect((await browser.post('/api/sky-windows', { cycleId, nodeIds: [], targets: [] })).body.fieldErrors).toEqual(
      expect.objectContaining({ nodeIds: expect.any(Array), targets: expect.any(Array) }),
    );
    const many = Array.from({ length: 51 }, (_, i) => ({ ra: i, dec: 0 }));
    const res = await browser.post('/api/sky-windows', { cycleId, nodeIds: [nodeId], targets: many });
    expect(res.status).toBe(400);
    expect(res.body.fieldErrors.includeNights).toBeDefined();
    expect((await browser.post('/api/sky-windows', { cycleId, nodeIds: [nodeId], targets: many, includeNights: false })).status).toBe(200);
  });

  it('applies the cycle visibility rule of GET /api/cycles/:id: a proposer gets the same 404 for an unannounced cycle; a facility manager gets its windows', async () => {
    const { browser: proposer } = await signedIn(h);
    const body = { cycleId: upcomingCycleId, nodeIds: [nodeId], targets: [{ ra: 10, dec: -40 }] };
    const cycle = await proposer.get(`/api/cycles/${upcomingCycleId}`);
    const windows = await proposer.post('/api/sky-windows', body);
    expect(cycle.status).toBe(404);
    expect(windows.status).toBe(404);
    expect(windows.body).toEqual(cycle.body);
    expect(JSON.stringify(windows.body)).not.toContain(`${tag}U`);
    const { browser: manager } = await signedIn(h, ['facility_manager']);
    const seen = await manager.post('/api/sky-windows', body);
    expect(seen.status).toBe(200);
    expect(seen.body.cycle.code).toBe(`${tag}U`);
  });

  it('refuses a request above the cost limit with 400 naming targets × nodes × nights and the limit; computes nothing', async () => {
    const { browser } = await signedIn(h);
    const targets = Array.from({ length: 500 }, (_, i) => ({ ra: (i * 0.7) % 360, dec: -30 }));
    const res = await browser.post('/api/sky-windows', {
      cycleId: yearCycleId,
      nodeIds: [nodeId, ...otherNodeIds],
      targets,
      includeNights: false,
    });
    expect(res.status).toBe(400);
    expect(res.body.code).toBe('sky_windows_too_large');
    expect(res.body.message).toBe(
      `The request asks for 500 targets × 3 nodes × 366 nights = 549,000 target-nights; at most ${SKY_WINDOWS_MAX_COST.toLocaleString('en-US')} per request: send fewer targets or nodes at a time`,
    );
    expect(res.body.fieldErrors.targets).toEqual([res.body.message]);
  });

  it('computes a request above the inline limit on a worker thread, with the same numbers as on the request thread', async () => {
    const { browser } = await signedIn(h);
    const targets = Array.from({ length: 40 }, (_, i) => ({ name: `Star T-${i + 1}`, ra: i * 9, dec: -70 + i * 3 }));
    const before = skyWindowsPoolStats().completedJobs;
    const res = await browser.post('/api/sky-windows', { cycleId: yearCycleId, nodeIds: [nodeId], targets });
    expect(res.status).toBe(200);
    expect(skyWindowsPoolStats().completedJobs).toBe(before + 1);
    const node = await h.created.ctx.db('nodes').where({ id: nodeId }).first();
    const [expected] = computeSkyWindowsJob({
      campaign: { firstNight: '2030-03-01', lastNight: '2031-03-01' },
      targets: targets.map((t) => ({ name: t.name, raDeg: t.ra, decDeg: t.dec })),
      includeNights: true,
      nodes: [
        {
          site: { latitudeDeg: -29.25, longitudeDeg: -70.73, elevationM: 2300, timeZone: 'America/Santiago' },
          limits: skyLimitsForNode({ altitudeLimitDeg: node.altitude_limit_deg, sunAltitudeLimitDeg: node.sun_altitude_limit_deg }),
        },
      ],
    });
    expect(res.body.nodes[0].report.nights).toHaveLength(366);
    expect(res.body.nodes[0].report.targets).toEqual(JSON.parse(JSON.stringify(expected.targets)));
  });
});
