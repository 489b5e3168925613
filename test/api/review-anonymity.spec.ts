/**
 * Anonymous review: in a cycle set to anonymous review, no answer a reviewer can get carries the
 * proposing team's names, e-mail addresses or affiliations, nor does the justification PDF's
 * file name. The same fetches in a cycle that is not anonymous do show the team, which proves
 * the scan can find them.
 */
import { Browser, signedIn, startHarness, type Harness } from '../support/api-harness';
import {
  addCoInvestigator,
  binaryBody,
  createTestNetwork,
  makeReady,
  proposerWithDraft,
  tinyPdf,
  uploadFile,
  type TestNetwork,
} from './support/proposal-kit';
import { assign, closeCall } from '../../server/src/features/review/reviewing/testing/review-fixtures';

let h: Harness;
let net: TestNetwork;

beforeAll(async () => {
  h = await startHarness();
  net = await createTestNetwork(h, 'RA');
}, 60_000);

afterAll(async () => {
  await net.cleanUp();
  await h.close();
});

/** Invented team details, distinctive enough that a stray copy cannot hide. */
const PI_NAME = 'Ysolde Quarrington-Vell';
const PI_AFFILIATION = 'Brackenmoor Lantern Observatory';
const COI_NAME = 'Tobiah Fenwrick-Olaru';
const COI_AFFILIATION = 'Saltmarsh Institute of Slow Rotators';

/** A submitted proposal in a closed cycle whose team has the names above, and its justification named after them. */
async function teamProposal(anonymous: boolean) {
  const cycle = await net.createCycle();
  const made = await submittedProposalWithTeam(cycle.id);
  await closeCall(h, cycle.id, { anonymous });
  return { cycle, ...made };
}

async function submittedProposalWithTeam(cycleId: number) {
  const db = h.created.ctx.db;
  // The team is named before submission (a submitted proposal's team is fixed).
  const made = await proposerWithDraft(h, cycleId, 'Spin-down of invented cluster members');
  const coi = await addCoInvestigator(h, made.browser, made.proposal.id);
  await db('accounts').where({ id: made.account.id }).update({ display_name: PI_NAME, affiliation: PI_AFFILIATION });
  await db('accounts').where({ id: coi.account.id }).update({ display_name: COI_NAME, affiliation: COI_AFFILIATION });
  await makeReady(h, made.browser, made.proposal.id, [net.nodeIds[0]]);
  const pdf = await uploadFile(
    made.browser,
    'put',
    `/api/proposals/${made.proposal.id}/justification`,
    tinyPdf(),
    'Quarrington-Vell and Fenwrick-Olaru justification.pdf',
  );
  if (pdf.status !== 200) throw new Error(`pdf failed: ${pdf.status}`);
  const submitted = await made.browser.post(`/api/proposals/${made.proposal.id}/submit`);
  if (submitted.status !== 200) throw new Error(`submit failed: ${submitted.status} ${JSON.stringify(submitted.body)}`);
  return { id: made.proposal.id, piEmail: made.account.email, coiEmail: coi.account.email };
}

/** Every JSON answer the reviewer can get about the proposal, and the PDF's file name. */
async function everythingTheReviewerSees(b: Browser, proposalId: number, cycleId: number) {
  const texts: { what: string; text: string }[] = [];
  const json = (what: string, res: { status: number; body: unknown }) => {
    expect({ what, ok: res.status < 500 }).toEqual({ what, ok: true });
    texts.push({ what, text: JSON.stringify(res.body) });
  };
  json('list', await b.get('/api/review/my'));
  json('list of the cycle', await b.get(`/api/review/my?cycleId=${cycleId}`));
  const reading = await b.get(`/api/review/my/${proposalId}`);
  json('reading', reading);
  const version = reading.body.review.version as number;
  for (const t of reading.body.targets as { id: number; plans: { nodeId: number }[] }[]) {
    for (const p of t.plans)
      json(`sky window of target ${t.id}`, await b.get(`/api/review/my/${proposalId}/targets/${t.id}/sky?nodeId=${p.nodeId}`));
  }
  expect(texts.some((t) => t.what.startsWith('sky window'))).toBe(true);
  json('save', await b.put(`/api/review/my/${proposalId}/review`, { version, grade: 6, strengths: '', weaknesses: '', committeeNote: '' }));
  json(
    'stale save (409 with the stored row)',
    await b.put(`/api/review/my/${proposalId}/review`, { version, grade: 6, strengths: '', weaknesses: '', committeeNote: '' }),
  );
  json(
    'refused save (400)',
    await b.put(`/api/review/my/${proposalId}/review`, {
      version: version + 1,
      grade: 6.25,
      strengths: '',
      weaknesses: '',
      committeeNote: '',
    }),
  );
  const pdf = await b.get(`/api/review/my/${proposalId}/justification`).buffer(true).parse(binaryBody);
  expect(pdf.status).toBe(200);
  texts.push({ what: 'PDF Content-Disposition', text: String(pdf.headers['content-disposition']) });
  json('submit', await b.post('/api/review/my/submit', { cycleId }));
  json('list after submit', await b.get('/api/review/my'));
  json('reading after submit', await b.get(`/api/review/my/${proposalId}`));
  return texts;
}

/** Every team detail: names, parts of names, e-mail addresses and their local parts, affiliations. */
function teamWords(t: { piEmail: string; coiEmail: string }): string[] {
  return [
    PI_NAME,
    COI_NAME,
    'Quarrington',
    'Fenwrick',
    PI_AFFILIATION,
    COI_AFFILIATION,
    'Brackenmoor',
    'Saltmarsh',
    t.piEmail,
    t.coiEmail,
    t.piEmail.split('@')[0],
    t.coiEmail.split('@')[0],
  ];
}

describe('anonymous review', () => {
  it('no answer the reviewer gets, nor the PDF’s file name, carries a team name, e-mail or affiliation', async () => {
    const t = await teamProposal(true);
    const me = await signedIn(h, ['reviewer']);
    await assign(h, t.id, me.account.id);
    const texts = await everythingTheReviewerSees(me.browser, t.id, t.cycle.id);
    expect(texts.length).toBeGreaterThanOrEqual(10);
    const leaks = texts.flatMap(({ what, text }) =>
      teamWords(t)
        .filter((w) => text.toLowerCase().includes(w.toLowerCase()))
        .map((w) => `${what}: ${w}`),
    );
    expect(leaks).toEqual([]);
    const reading = await me.browser.get(`/api/review/my/${t.id}`);
    expect(reading.body.team).toBeNull();
    expect(reading.body.review.team).toBeNull();
  });

  it('control: in a cycle that is not anonymous the same scan finds the PI’s name and both affiliations', async () => {
    const t = await teamProposal(false);
    const me = await signedIn(h, ['reviewer']);
    await assign(h, t.id, me.account.id);
    const texts = await everythingTheReviewerSees(me.browser, t.id, t.cycle.id);
    const reading = texts.find((x) => x.what === 'reading')!.text;
    expect(reading).toContain(PI_NAME);
    expect(reading).toContain(PI_AFFILIATION);
    expect(reading).toContain(COI_AFFILIATION);
    // E-mail addresses are never part of a reviewer's answers, anonymous or not.
    expect(texts.some((x) => x.text.includes(t.piEmail) || x.text.includes(t.coiEmail))).toBe(false);
    // The file name stays neutral in every cycle.
    expect(texts.find((x) => x.what === 'PDF Content-Disposition')!.text).toBe(`inline; filename="proposal-${t.id}-justification.pdf"`);
  });
});
