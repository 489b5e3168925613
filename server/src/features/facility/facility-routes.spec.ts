import { Browser, signedIn, startHarness, type Harness } from '../../../../test/support/api-harness';

let h: Harness;
let siteId: number;
let nodeId: number;
let cycleId: number;
const tag = `T${Date.now().toString(36).toUpperCase()}`;

beforeAll(async () => {
  h = await startHarness();
  const db = h.created.ctx.db;
  [{ id: siteId }] = await db('sites')
    .insert({
      code: `${tag}S`,
      name: 'Test Hill',
      latitude_deg: -31.5,
      longitude_deg: 150.25,
      elevation_m: 900,
      time_zone: 'Australia/Sydney',
      sky_brightness_mag_per_arcsec2: 21,
    })
    .returning('id');
  [{ id: nodeId }] = await db('nodes')
    .insert({
      code: `${tag}N`,
      name: 'Test 40',
      site_id: siteId,
      aperture_m: 0.4,
      obstruction_fraction: 0.4,
      throughput: 0.5,
      band: 'V',
      read_noise_e: 10,
      dark_current_e_per_s: 0.02,
      gain_e_per_adu: 1.2,
      saturation_e: 60000,
      pixel_scale_arcsec: 1,
      seeing_fwhm_arcsec: 2,
      systematic_floor_mmag: 1,
      scintillation_model: 'young1967',
      overhead_seconds: 60,
      min_exposure_seconds: 1,
      max_exposure_seconds: 300,
      altitude_limit_deg: 30,
      weather_loss_fraction: 0.3,
      rate_minor_per_hour: 2500,
      currency: 'eur',
    })
    .returning('id');
  const now = Date.now();
  [{ id: cycleId }] = await db('cycles')
    .insert({
      code: `${tag}C`,
      title: 'Test cycle',
      call_opens_at: new Date(now - 86400_000),
      call_closes_at: new Date(now + 86400_000),
      campaign_start: '2031-02-01',
      campaign_end: '2031-07-31',
      categories: ['A', 'B'],
    })
    .returning('id');
  await db('cycle_nodes').insert({ cycle_id: cycleId, node_id: nodeId, node_hours_available: 123.5 });
});
afterAll(async () => {
  const db = h.created.ctx.db;
  await db('cycles').where({ id: cycleId }).del();
  await db('nodes').where({ id: nodeId }).del();
  await db('sites').where({ id: siteId }).del();
  await h.close();
});

describe('facility read routes', () => {
  it('GET /api/nodes returns camelCase nodes with their site', async () => {
    const { browser } = await signedIn(h);
    const res = await browser.get('/api/nodes');
    const node = res.body.find((n: { id: number }) => n.id === nodeId);
    expect(node).toMatchObject({
      code: `${tag}N`,
      apertureM: 0.4,
      scintillationModel: 'young1967',
      rateMinorPerHour: 2500,
      currency: 'eur',
      site: { id: siteId, latitudeDeg: -31.5, longitudeDeg: 150.25, timeZone: 'Australia/Sydney' },
    });
  });

  it('a node stored without a scintillation model gets Osborn et al. (2015), the default', async () => {
    const db = h.created.ctx.db;
    const [{ id }] = await db('nodes')
      .insert({
        code: `${tag}D`,
        name: 'Test default',
        site_id: siteId,
        aperture_m: 0.3,
        obstruction_fraction: 0.4,
        throughput: 0.5,
        band: 'R',
        read_noise_e: 10,
        dark_current_e_per_s: 0.02,
        gain_e_per_adu: 1.2,
        saturation_e: 60000,
        pixel_scale_arcsec: 1,
        seeing_fwhm_arcsec: 2,
        systematic_floor_mmag: 1,
        overhead_seconds: 60,
        min_exposure_seconds: 1,
        max_exposure_seconds: 300,
        altitude_limit_deg: 30,
        weather_loss_fraction: 0.3,
        rate_minor_per_hour: 2000,
        currency: 'eur',
      })
      .returning('id');
    try {
      const { browser } = await signedIn(h);
      const node = (await browser.get('/api/nodes')).body.find((n: { id: number }) => n.id === id);
      expect(node).toMatchObject({ code: `${tag}D`, scintillationModel: 'osborn2015' });
      // The uncorrected Young (1967) formula stays allowed (the node above uses it); others are refused.
      await expect(db('nodes').where({ id }).update({ scintillation_model: 'kolmogorov' })).rejects.toThrow(/nodes_scintillation_check/);
    } finally {
      await db('nodes').where({ id }).del();
    }
  });

  it('GET /api/cycles returns the call status and the node capacity', async () => {
    const { browser } = await signedIn(h);
    const res = await browser.get('/api/cycles');
    const cycle = res.body.find((c: { id: number }) => c.id === cycleId);
    expect(cycle).toMatchObject({
      status: 'open',
      campaignStart: '2031-02-01',
      categories: ['A', 'B'],
      nodes: [{ nodeId, nodeCode: `${tag}N`, nodeHoursAvailable: 123.5 }],
    });
  });
});

describe('PATCH /api/nodes/:id: the external rate', () => {
  const stored = async () =>
    (await h.created.ctx.db('nodes').where({ id: nodeId }).first('external_rate_minor_per_hour', 'rate_minor_per_hour')) as {
      external_rate_minor_per_hour: number | null;
      rate_minor_per_hour: number;
    };

  afterEach(async () => {
    await h.created.ctx.db('nodes').where({ id: nodeId }).update({ external_rate_minor_per_hour: null });
  });

  it('a node without an external rate reads externalRateMinorPerHour null', async () => {
    const { browser } = await signedIn(h);
    const node = (await browser.get('/api/nodes')).body.find((n: { id: number }) => n.id === nodeId);
    expect(node).toMatchObject({ rateMinorPerHour: 2500, externalRateMinorPerHour: null });
  });

  it('a facility manager sets it: answered, stored, read back by everyone; the academic rate stays', async () => {
    const { browser } = await signedIn(h, ['facility_manager']);
    const res = await browser.patch(`/api/nodes/${nodeId}`, { externalRateMinorPerHour: 4000 });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({
      id: nodeId,
      code: `${tag}N`,
      rateMinorPerHour: 2500,
      externalRateMinorPerHour: 4000,
      site: { id: siteId },
    });
    expect(await stored()).toEqual({ external_rate_minor_per_hour: 4000, rate_minor_per_hour: 2500 });
    const { browser: proposer } = await signedIn(h);
    const node = (await proposer.get('/api/nodes')).body.find((n: { id: number }) => n.id === nodeId);
    expect(node).toMatchObject({ rateMinorPerHour: 2500, externalRateMinorPerHour: 4000 });
  });

  it('0 is a rate (free for external programs), not "unset"', async () => {
    const { browser } = await signedIn(h, ['facility_manager']);
    const res = await browser.patch(`/api/nodes/${nodeId}`, { externalRateMinorPerHour: 0 });
    expect(res.status).toBe(200);
    expect(res.body.externalRateMinorPerHour).toBe(0);
    expect((await stored()).external_rate_minor_per_hour).toBe(0);
  });

  it('null clears it (external programs pay the academic rate again)', async () => {
    await h.created.ctx.db('nodes').where({ id: nodeId }).update({ external_rate_minor_per_hour: 3100 });
    const { browser } = await signedIn(h, ['facility_manager']);
    const res = await browser.patch(`/api/nodes/${nodeId}`, { externalRateMinorPerHour: null });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ rateMinorPerHour: 2500, externalRateMinorPerHour: null });
    expect((await stored()).external_rate_minor_per_hour).toBeNull();
  });

  it.each([
    ['a fraction of the smallest unit', 40.5],
    ['a negative rate', -1],
    ['text', '4000'],
    ['a rate beyond the column (2³¹)', 2_147_483_648],
  ])('refuses %s with 400 naming externalRateMinorPerHour, and stores nothing', async (_what, value) => {
    await h.created.ctx.db('nodes').where({ id: nodeId }).update({ external_rate_minor_per_hour: 3100 });
    const { browser } = await signedIn(h, ['facility_manager']);
    const res = await browser.patch(`/api/nodes/${nodeId}`, { externalRateMinorPerHour: value });
    expect(res.status).toBe(400);
    expect(res.body.code).toBe('validation_failed');
    expect(res.body.message).toMatch(/^externalRateMinorPerHour: /);
    expect(Object.keys(res.body.fieldErrors)).toEqual(['externalRateMinorPerHour']);
    expect((await stored()).external_rate_minor_per_hour).toBe(3100);
  });

  it('refuses a field it cannot change (the academic rate) instead of ignoring it, and an empty body', async () => {
    const { browser } = await signedIn(h, ['facility_manager']);
    const academic = await browser.patch(`/api/nodes/${nodeId}`, { externalRateMinorPerHour: 4000, rateMinorPerHour: 1 });
    expect(academic.status).toBe(400);
    expect(academic.body.message).toContain('rateMinorPerHour');
    const empty = await browser.patch(`/api/nodes/${nodeId}`, {});
    expect(empty.status).toBe(400);
    expect(empty.body.message).toContain('externalRateMinorPerHour');
    expect(await stored()).toEqual({ external_rate_minor_per_hour: null, rate_minor_per_hour: 2500 });
  });

  it('an unknown node answers 404; a malformed id 400', async () => {
    const { browser } = await signedIn(h, ['facility_manager']);
    const missing = await browser.patch('/api/nodes/2147483000', { externalRateMinorPerHour: 10 });
    expect(missing.status).toBe(404);
    expect(missing.body.code).toBe('node_not_found');
    const malformed = await browser.patch('/api/nodes/1e3', { externalRateMinorPerHour: 10 });
    expect(malformed.status).toBe(400);
    expect(malformed.body.message).toMatch(/^id: /);
  });

  it('other roles are refused (403) and nothing changes; signed out 401', async () => {
    const { browser } = await signedIn(h, ['proposer', 'reviewer', 'billing_contact', 'administrator']);
    const res = await browser.patch(`/api/nodes/${nodeId}`, { externalRateMinorPerHour: 9999 });
    expect(res.status).toBe(403);
    expect(res.body.code).toBe('forbidden');
    const anonymous = await new Browser(h).patch(`/api/nodes/${nodeId}`, { externalRateMinorPerHour: 9999 });
    expect(anonymous.status).toBe(401);
    expect((await stored()).external_rate_minor_per_hour).toBeNull();
  });
});
