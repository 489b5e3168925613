/**
 * Shared set-up of the proposal tests: a small invented network (two sites, three nodes), an
 * open cycle with a short campaign, proposals with targets, multipart uploads through the
 * CSRF-aware browser, and the clean-up of everything created.
 */
import type { TargetInput } from '@spincycle/shared/proposals/target-schemas';
import { Browser, createAccount, type Harness } from '../../support/api-harness';
import { computeAndStoreProposalPlans } from '../../../server/src/features/proposals/plans/plan-service';

export interface TestNetwork {
  tag: string;
  siteIds: number[];
  nodeIds: number[];
  /** North (V), north (R), south (R). */
  nodes: { id: number; code: string }[];
  cycleIds: number[];
  cycleId: number;
  cycleCode: string;
  /** Another open cycle with a node not in `cycleId`. */
  createCycle(options?: {
    opensInMs?: number;
    closesInMs?: number;
    nodeIds?: number[];
    campaignNights?: number;
  }): Promise<{ id: number; code: string; callClosesAt: Date }>;
  cleanUp(): Promise<void>;
}

let counter = 0;

/** Creates the network and one open cycle (call closes in a day; 60-night campaign). */
export async function createTestNetwork(h: Harness, prefix = 'P'): Promise<TestNetwork> {
  const db = h.created.ctx.db;
  const tag = `${prefix}${Date.now().toString(36).toUpperCase()}${(counter++).toString(36).toUpperCase()}`;
  const sites = await db('sites')
    .insert([
      {
        code: `${tag}N`,
        name: 'Test North',
        latitude_deg: 34.9,
        longitude_deg: -108.4,
        elevation_m: 2210,
        time_zone: 'America/Denver',
        sky_brightness_mag_per_arcsec2: 21.6,
      },
      {
        code: `${tag}S`,
        name: 'Test South',
        latitude_deg: -27.45,
        longitude_deg: -69.95,
        elevation_m: 2380,
        time_zone: 'America/Santiago',
        sky_brightness_mag_per_arcsec2: 21.8,
      },
    ])
    .returning('id');
  const siteIds = sites.map((s: { id: number }) => s.id);
  const common = {
    obstruction_fraction: 0.4,
    throughput: 0.55,
    read_noise_e: 9,
    dark_current_e_per_s: 0.02,
    gain_e_per_adu: 1.3,
    saturation_e: 80000,
    pixel_scale_arcsec: 0.8,
    seeing_fwhm_arcsec: 1.6,
    systematic_floor_mmag: 1,
    scintillation_model: 'young1967',
    overhead_seconds: 45,
    min_exposure_seconds: 2,
    max_exposure_seconds: 300,
    altitude_limit_deg: 25,
    sun_altitude_limit_deg: -18,
    weather_loss_fraction: 0.3,
    currency: 'eur',
  };
  const nodes = await db('nodes')
    .insert([
      { ...common, code: `${tag}-50`, name: 'Test 50', site_id: siteIds[0], aperture_m: 0.5, band: 'V', rate_minor_per_hour: 4500 },
      { ...common, code: `${tag}-40`, name: 'Test 40', site_id: siteIds[0], aperture_m: 0.4, band: 'R', rate_minor_per_hour: 3000 },
      {
        ...common,
        code: `${tag}-99`,
        name: 'Test 100',
        site_id: siteIds[1],
        aperture_m: 1.0,
        band: 'R',
        rate_minor_per_hour: 12000,
        saturation_e: 120000,
      },
    ])
    .returning(['id', 'code']);
  const nodeIds = nodes.map((n: { id: number }) => n.id);
  const cycleIds: number[] = [];
  let cycles = 0;
  const createCycle: TestNetwork['createCycle'] = async (options = {}) => {
    const now = Date.now();
    const code = `${tag}C${cycles++}`;
    const start = new Date(now + 40 * 86400_000);
    const end = new Date(start.getTime() + ((options.campaignNights ?? 60) - 1) * 86400_000);
    const callClosesAt = new Date(now + (options.closesInMs ?? 86400_000));
    const [{ id }] = await db('cycles')
      .insert({
        code,
        title: `Test cycle ${code}`,
        call_opens_at: new Date(now + (options.opensInMs ?? -86400_000)),
        call_closes_at: callClosesAt,
        campaign_start: start.toISOString().slice(0, 10),
        campaign_end: end.toISOString().slice(0, 10),
        categories: ['Open clusters', 'Field stars'],
      })
      .returning('id');
    await db('cycle_nodes').insert(
      (options.nodeIds ?? nodeIds).map((nodeId) => ({ cycle_id: id, node_id: nodeId, node_hours_available: 500 })),
    );
    cycleIds.push(id);
    return { id, code, callClosesAt };
  };
  const first = await createCycle();
  return {
    tag,
    siteIds,
    nodeIds,
    nodes,
    cycleIds,
    cycleId: first.id,
    cycleCode: first.code,
    createCycle,
    async cleanUp() {
      await db('proposals').whereIn('cycle_id', cycleIds).del();
      await db('cycles').whereIn('id', cycleIds).del();
      await db('nodes').whereIn('id', nodeIds).del();
      await db('sites').whereIn('id', siteIds).del();
    },
  };
}

/** A valid target row (override what the test is about). */
export function target(overrides: Partial<TargetInput> = {}): TargetInput {
  return {
    name: `Star T-${counter++}`,
    raDeg: 163.2,
    decDeg: 31.6,
    magnitude: 12,
    magnitudeBand: 'V',
    colour: 1.0,
    colourSystem: 'BPRP',
    reddeningEbv: null,
    ageMyr: 650,
    ageUncertaintyMyr: 60,
    periodPrecisionDays: null,
    periodDays: null,
    periodUncertaintyDays: null,
    notes: '',
    ...overrides,
  };
}

/** The CSV header of the target list. */
export const CSV_HEADER =
  'name,ra,dec,magnitude,band,colour,colour_system,ebv,age_myr,age_err_myr,period_precision_d,period,period_error,notes';

/** A valid CSV data line. */
export function csvLine(
  name: string,
  overrides: Partial<
    Record<'ra' | 'dec' | 'magnitude' | 'band' | 'colour' | 'colour_system' | 'age' | 'period' | 'period_error', string>
  > = {},
): string {
  const o = {
    ra: '163.2',
    dec: '31.6',
    magnitude: '12.1',
    band: 'V',
    colour: '1.1',
    colour_system: 'BPRP',
    age: '650',
    period: '',
    period_error: '',
    ...overrides,
  };
  return `${name},${o.ra},${o.dec},${o.magnitude},${o.band},${o.colour},${o.colour_system},,${o.age},60,,${o.period},${o.period_error},`;
}

/** A multipart upload of one file, with the CSRF header like the client sends it. */
export async function uploadFile(
  b: Browser,
  method: 'post' | 'put',
  url: string,
  content: Buffer | string,
  filename: string,
  options: { field?: string; contentType?: string } = {},
) {
  await b.ready();
  return b.agent[method](url)
    .set('X-XSRF-TOKEN', b.xsrf() ?? '')
    .attach(options.field ?? 'file', Buffer.isBuffer(content) ? content : Buffer.from(content, 'utf8'), {
      filename,
      contentType: options.contentType ?? (filename.endsWith('.pdf') ? 'application/pdf' : 'text/csv'),
    });
}

/** A signed-in proposer and their new draft in the cycle. */
export async function proposerWithDraft(h: Harness, cycleId: number, title = 'Test proposal') {
  const account = await createAccount(h, ['proposer']);
  const browser = await new Browser(h).signIn(account.email);
  const res = await browser.post('/api/proposals', { cycleId, title });
  if (res.status !== 201) throw new Error(`create failed: ${res.status} ${JSON.stringify(res.body)}`);
  return { account, browser, proposal: res.body as { id: number; version: number } };
}

/** Invites a fresh account and accepts with it: an active co-investigator. */
export async function addCoInvestigator(h: Harness, pi: Browser, proposalId: number) {
  const account = await createAccount(h, ['proposer']);
  const invite = await pi.post(`/api/proposals/${proposalId}/members`, { email: account.email });
  if (invite.status !== 201) throw new Error(`invite failed: ${invite.status} ${JSON.stringify(invite.body)}`);
  const mail = await h.mail.waitFor((m) => m.to.includes(account.email));
  const token = /invitations\/([A-Za-z0-9_-]+)/.exec(mail.text)![1];
  const browser = await new Browser(h).signIn(account.email);
  const accepted = await browser.post('/api/invitations/accept', { token });
  if (accepted.status !== 200) throw new Error(`accept failed: ${accepted.status} ${JSON.stringify(accepted.body)}`);
  return { account, browser, memberId: invite.body.id as number };
}

/** A supertest parser that keeps a binary body (a PDF) as one Buffer: `.buffer(true).parse(binaryBody)`. */
export function binaryBody(res: import('superagent').Response, cb: (err: Error | null, body: Buffer) => void): void {
  const chunks: Buffer[] = [];
  res.on('data', (c: Buffer) => chunks.push(c));
  res.on('end', () => cb(null, Buffer.concat(chunks)));
}

/** A minimal valid PDF (header, one empty page, %%EOF). */
export function tinyPdf(text = 'Scientific justification'): Buffer {
  const body = `%PDF-1.4\n1 0 obj << /Type /Catalog /Pages 2 0 R >> endobj\n2 0 obj << /Type /Pages /Kids [3 0 R] /Count 1 >> endobj\n3 0 obj << /Type /Page /Parent 2 0 R /MediaBox [0 0 595 842] >> endobj\n% ${text}\ntrailer << /Root 1 0 R >>\n%%EOF\n`;
  return Buffer.from(body, 'latin1');
}

/**
 * Makes a draft ready to submit: abstract, category, nodes, targets, justification, and its
 * plans computed in-process (no queue).
 */
export async function makeReady(
  h: Harness,
  pi: Browser,
  proposalId: number,
  nodeIds: number[],
  targets = [target(), target({ colour: 2.0, magnitude: 14 })],
) {
  const current = (await pi.get(`/api/proposals/${proposalId}`)).body;
  const patch = await pi.patch(`/api/proposals/${proposalId}`, {
    version: current.version,
    abstract:
      'We will measure rotation periods of cool dwarfs in an invented open cluster to calibrate the spin-down relation at 650 Myr, with nightly photometry.',
    category: 'Open clusters',
    nodeIds,
  });
  if (patch.status !== 200) throw new Error(`patch failed: ${patch.status} ${JSON.stringify(patch.body)}`);
  for (const t of targets) {
    const res = await pi.post(`/api/proposals/${proposalId}/targets`, t);
    if (res.status !== 201) throw new Error(`target failed: ${res.status} ${JSON.stringify(res.body)}`);
  }
  const pdf = await uploadFile(pi, 'put', `/api/proposals/${proposalId}/justification`, tinyPdf(), 'justification.pdf');
  if (pdf.status !== 200) throw new Error(`pdf failed: ${pdf.status} ${JSON.stringify(pdf.body)}`);
  await computeAndStoreProposalPlans(h.created.ctx.db, proposalId);
}

/** Rows of a table (for before/after counts). */
export async function countRows(h: Harness, table: string, where: Record<string, unknown> = {}): Promise<number> {
  const [{ n }] = await h.created.ctx.db(table).where(where).count<{ n: number }[]>({ n: '*' });
  return n;
}
