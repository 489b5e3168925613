import { startHarness, type Browser, type Harness } from '../../../../../test/support/api-harness';
import {
  addCoInvestigator,
  binaryBody,
  createTestNetwork,
  CSV_HEADER,
  csvLine,
  makeReady,
  proposerWithDraft,
  target,
  tinyPdf,
  uploadFile,
  type TestNetwork,
} from '../../../../../test/api/support/proposal-kit';

let h: Harness;
let net: TestNetwork;
beforeAll(async () => {
  h = await startHarness();
  net = await createTestNetwork(h, 'SU');
});
afterEach(() => {
  h.created.ctx.now = () => new Date();
});
afterAll(async () => {
  await net.cleanUp();
  await h.close();
});

/** Stands the server's clock at an instant. */
const setClock = (at: number) => {
  h.created.ctx.now = () => new Date(at);
};

describe('GET /api/proposals/:id/readiness', () => {
  it('lists every problem of a new draft, by field', async () => {
    const { browser, proposal } = await proposerWithDraft(h, net.cycleId);
    const res = await browser.get(`/api/proposals/${proposal.id}/readiness`);
    expect(res.status).toBe(200);
    expect(res.body.ready).toBe(false);
    expect(res.body.problems.map((p: { field: string }) => p.field)).toEqual([
      'abstract',
      'category',
      'nodeIds',
      'targets',
      'justification',
    ]);
    expect(res.body.problems[0].message).toMatch(/at least 100 characters \(it has 0\)/);
    expect(res.body.warnings).toEqual([]);
  });

  it('is ready once everything is there and the plans are current; infeasible plans are a warning only', async () => {
    const { browser, proposal } = await proposerWithDraft(h, net.cycleId);
    // Dec −80° never rises at the northern site: infeasible there.
    await makeReady(h, browser, proposal.id, [net.nodeIds[0], net.nodeIds[2]], [target(), target({ decDeg: -80, raDeg: 90 })]);
    const res = (await browser.get(`/api/proposals/${proposal.id}/readiness`)).body;
    expect(res).toMatchObject({ ready: true, problems: [] });
    expect(res.warnings).toEqual([{ field: 'plans', message: expect.stringMatching(/^\d+ of 4 target plans are infeasible/) }]);
  });

  it('reports plans that are out of date or being computed', async () => {
    const { browser, proposal } = await proposerWithDraft(h, net.cycleId);
    await makeReady(h, browser, proposal.id, [net.nodeIds[0]]);
    await browser.post(`/api/proposals/${proposal.id}/targets`, target());
    const res = (await browser.get(`/api/proposals/${proposal.id}/readiness`)).body;
    expect(res.ready).toBe(false);
    expect(res.problems).toEqual([{ field: 'plans', message: expect.stringMatching(/being computed/) }]);
  });
});

describe("readiness against the cycle's capacity", () => {
  /** A ready draft on node 0 of a fresh cycle whose capacity there is below the draft's request. */
  async function overCapacity(rule?: 'warn' | 'block') {
    const cycle = await net.createCycle({ closesInMs: 3 * 86400_000 });
    if (rule) await h.created.ctx.db('cycles').where({ id: cycle.id }).update({ capacity_overrun: rule });
    const { browser, proposal } = await proposerWithDraft(h, cycle.id);
    await makeReady(h, browser, proposal.id, [net.nodeIds[0]]);
    const requested = (await browser.get(`/api/proposals/${proposal.id}`)).body.request[0].nodeHours as number;
    const capacity = Math.floor(requested / 2);
    await h.created.ctx.db('cycle_nodes').where({ cycle_id: cycle.id, node_id: net.nodeIds[0] }).update({ node_hours_available: capacity });
    return { browser, id: proposal.id, requested, capacity, cycleId: cycle.id };
  }

  it('warn (the default): ready, with a warning naming node, request and capacity; submission goes through', async () => {
    const { browser, id, requested, capacity } = await overCapacity();
    const res = (await browser.get(`/api/proposals/${id}/readiness`)).body;
    expect(res).toMatchObject({ ready: true, problems: [] });
    expect(res.warnings.filter((w: { field: string }) => w.field === 'request')).toEqual([
      {
        field: 'request',
        message: `${Math.round(requested * 100) / 100} node-hours are requested on ${net.nodes[0].code}, more than the ${capacity} the cycle offers there; it can be submitted, and the panel sees the overrun`,
      },
    ]);
    expect((await browser.post(`/api/proposals/${id}/submit`)).status).toBe(200);
  });

  it('block: not ready (the overrun is a problem), and submit answers 422 not_ready with fieldErrors.request', async () => {
    const { browser, id } = await overCapacity('block');
    const res = (await browser.get(`/api/proposals/${id}/readiness`)).body;
    expect(res.ready).toBe(false);
    expect(res.problems).toEqual([
      {
        field: 'request',
        message: expect.stringMatching(/^[\d.]+ node-hours are requested on .*; this cycle accepts no request above a node's capacity/),
      },
    ]);
    const submit = await browser.post(`/api/proposals/${id}/submit`);
    expect(submit.status).toBe(422);
    expect(submit.body).toMatchObject({ code: 'not_ready', fieldErrors: { request: [expect.any(String)] } });
  });

  it('a request within capacity gives neither', async () => {
    const { browser, id, cycleId, requested } = await overCapacity('block');
    await h.created.ctx.db('cycle_nodes').where({ cycle_id: cycleId, node_id: net.nodeIds[0] }).update({ node_hours_available: requested });
    const res = (await browser.get(`/api/proposals/${id}/readiness`)).body;
    expect(res).toMatchObject({ ready: true, problems: [] });
    expect(res.warnings.filter((w: { field: string }) => w.field === 'request')).toEqual([]);
  });

  it("the proposal's request shows the infeasible plans' node-hours apart from the requested ones", async () => {
    const { browser, proposal } = await proposerWithDraft(h, net.cycleId);
    await makeReady(h, browser, proposal.id, [net.nodeIds[0]], [target(), target({ decDeg: -80, raDeg: 90 })]);
    const [r] = (await browser.get(`/api/proposals/${proposal.id}`)).body.request;
    expect(r.infeasibleTargets).toBe(1);
    expect(r.infeasibleNodeHours).toBeGreaterThan(0);
    const plans = (await h.created.ctx
      .db('target_plans')
      .where({ proposal_id: proposal.id, node_id: net.nodeIds[0] })
      .select('node_hours', 'feasible')) as { node_hours: number; feasible: boolean }[];
    const sum = (feasible: boolean) => plans.filter((p) => p.feasible === feasible).reduce((s, p) => s + p.node_hours, 0);
    expect(r.nodeHours).toBeCloseTo(sum(true), 2);
    expect(r.infeasibleNodeHours).toBeCloseTo(sum(false), 2);
  });
});

describe('POST /api/proposals/:id/submit', () => {
  it('refuses a draft that is not ready with 422 not_ready and the problems as fieldErrors', async () => {
    const { browser, proposal } = await proposerWithDraft(h, net.cycleId);
    const res = await browser.post(`/api/proposals/${proposal.id}/submit`);
    expect(res.status).toBe(422);
    expect(res.body.code).toBe('not_ready');
    expect(res.body.message).toMatch(/^The proposal is not ready to submit: write an abstract .* \(and 4 more\)$/);
    expect(Object.keys(res.body.fieldErrors).sort()).toEqual(['abstract', 'category', 'justification', 'nodeIds', 'targets']);
  });

  it('deadline: one second before the closing instant → 200; at it → 422 call_closed with the deadline; after it → 422', async () => {
    const cycle = await net.createCycle({ closesInMs: 3 * 86400_000 });
    const closes = cycle.callClosesAt.getTime();
    const deadline = `${cycle.callClosesAt.toISOString().slice(0, 10)} ${cycle.callClosesAt.toISOString().slice(11, 19)} UTC`;
    const drafts: { browser: Browser; id: number }[] = [];
    for (let i = 0; i < 3; i++) {
      const d = await proposerWithDraft(h, cycle.id, `Deadline ${i}`);
      await makeReady(h, d.browser, d.proposal.id, [net.nodeIds[0]]);
      drafts.push({ browser: d.browser, id: d.proposal.id });
    }
    setClock(closes - 1000);
    const before = await drafts[0].browser.post(`/api/proposals/${drafts[0].id}/submit`);
    expect(before.status).toBe(200);
    expect(before.body).toMatchObject({ state: 'submitted', submittedAt: new Date(closes - 1000).toISOString(), editable: false });

    setClock(closes);
    const at = await drafts[1].browser.post(`/api/proposals/${drafts[1].id}/submit`);
    expect(at.status).toBe(422);
    expect(at.body).toMatchObject({ code: 'call_closed', message: `The call for ${cycle.code} closed at ${deadline}` });

    setClock(closes + 1000);
    const after = await drafts[2].browser.post(`/api/proposals/${drafts[2].id}/submit`);
    expect(after.status).toBe(422);
    expect(after.body.code).toBe('call_closed');
    expect(after.body.message).toContain(deadline);
    // And the late draft can no longer be edited either.
    const edit = await drafts[2].browser.patch(`/api/proposals/${drafts[2].id}`, { version: 2, title: 'Late' });
    expect(edit.status).toBe(409);
    expect(edit.body).toMatchObject({ code: 'not_editable', message: expect.stringContaining(deadline) });
    expect((await drafts[2].browser.get(`/api/proposals/${drafts[2].id}`)).body.editable).toBe(false);
  });

  it('only the PI submits; the receipt goes to every active member with the request, the total and the fee caution', async () => {
    const { account, browser: pi, proposal } = await proposerWithDraft(h, net.cycleId, 'Receipt check');
    const coi = await addCoInvestigator(h, pi, proposal.id);
    await pi.post(`/api/proposals/${proposal.id}/members`, { email: 'pending-invitee@test.example' });
    await makeReady(h, pi, proposal.id, [net.nodeIds[0], net.nodeIds[2]]);
    const refused = await coi.browser.post(`/api/proposals/${proposal.id}/submit`);
    expect(refused.status).toBe(403);
    expect(refused.body.code).toBe('pi_only');

    const res = await pi.post(`/api/proposals/${proposal.id}/submit`);
    expect(res.status).toBe(200);
    const mail = await h.mail.waitFor((m) => m.subject.startsWith('Proposal submitted') && m.subject.includes('Receipt check'));
    expect(mail.to.sort()).toEqual([account.email, coi.account.email].sort());
    expect(mail.subject).toBe(`Proposal submitted: “Receipt check” (${net.cycleCode})`);
    const text = mail.text;
    expect(text).toContain('Title:         Receipt check');
    expect(text).toContain(`Cycle:         ${net.cycleCode}`);
    expect(text).toMatch(/Submitted at: {2}\d{4}-\d\d-\d\d \d\d:\d\d:\d\d UTC/);
    expect(text).toContain('Targets:       2');
    for (const r of res.body.request) {
      const fee = `EUR ${(r.feeMinor / 100).toLocaleString('en-GB', { minimumFractionDigits: 2 })}`;
      expect(text).toMatch(new RegExp(`${r.nodeCode}\\s+${r.nodeHours.toFixed(2)} node-hours\\s+${fee.replace(/[.]/g, '\\.')}`));
    }
    const totalHours = res.body.request.reduce((s: number, r: { nodeHours: number }) => s + r.nodeHours, 0);
    expect(text).toMatch(new RegExp(`Total\\s+${totalHours.toFixed(2)} node-hours`));
    expect(text).toContain("The consortium's own terms and local tax rules govern every fee and invoice.");
    expect(mail.to).not.toContain('pending-invitee@test.example');
  });

  it('after submission every edit route answers 409 not_editable; reads still work; withdrawing makes it a draft again', async () => {
    const { browser: pi, proposal } = await proposerWithDraft(h, net.cycleId);
    await makeReady(h, pi, proposal.id, [net.nodeIds[0]]);
    expect((await pi.post(`/api/proposals/${proposal.id}/submit`)).status).toBe(200);
    const [t] = (await pi.get(`/api/proposals/${proposal.id}/targets`)).body;
    const p = (await pi.get(`/api/proposals/${proposal.id}`)).body;
    const piMember = p.team[0];
    const base = `/api/proposals/${proposal.id}`;
    const csv = [CSV_HEADER, csvLine('Star Z-1')].join('\n');
    const attempts = [
      () => pi.patch(base, { version: p.version, title: 'Changed' }),
      () => pi.post(`${base}/targets`, target()),
      () => pi.put(`${base}/targets/${t.id}`, { version: t.version, target: target() }),
      () => pi.delete(`${base}/targets/${t.id}`),
      () => uploadFile(pi, 'post', `${base}/targets/upload`, csv, 'x.csv'),
      () => uploadFile(pi, 'put', `${base}/justification`, tinyPdf(), 'j.pdf'),
      () => pi.post(`${base}/members`, { email: 'late@test.example' }),
      () => pi.delete(`${base}/members/${piMember.id}`),
      () => pi.post(`${base}/plans/recompute`),
      () => pi.delete(base),
      () => pi.post(`${base}/submit`),
    ];
    for (const attempt of attempts) {
      const res = await attempt();
      expect(res.status).toBe(409);
      expect(res.body.code).toBe('not_editable');
    }
    for (const path of ['', '/targets', '/targets.csv', '/plans', '/readiness', '/justification', '/summary.pdf']) {
      expect((await pi.get(`${base}${path}`)).status).toBe(200);
    }
    const withdrawn = await pi.post(`${base}/withdraw`);
    expect(withdrawn.status).toBe(200);
    expect(withdrawn.body).toMatchObject({ state: 'draft', submittedAt: null, editable: true });
    expect((await pi.post(`${base}/withdraw`)).body.code).toBe('not_submitted');
    expect((await pi.patch(base, { version: withdrawn.body.version, title: 'Changed after withdrawal' })).status).toBe(200);
  });

  it('withdrawal needs the PI and an open call (422 call_closed after the deadline)', async () => {
    const cycle = await net.createCycle({ closesInMs: 86400_000 });
    const { browser: pi, proposal } = await proposerWithDraft(h, cycle.id);
    const coi = await addCoInvestigator(h, pi, proposal.id);
    await makeReady(h, pi, proposal.id, [net.nodeIds[0]]);
    expect((await pi.post(`/api/proposals/${proposal.id}/submit`)).status).toBe(200);
    expect((await coi.browser.post(`/api/proposals/${proposal.id}/withdraw`)).status).toBe(403);
    setClock(cycle.callClosesAt.getTime());
    const late = await pi.post(`/api/proposals/${proposal.id}/withdraw`);
    expect(late.status).toBe(422);
    expect(late.body).toMatchObject({
      code: 'call_closed',
      message: expect.stringMatching(/closed at .* UTC; the proposal can no longer be withdrawn$/),
    });
  });
});

/** One text-showing operation of a PDF page: its font (base name), size and decoded text. */
interface TextRun {
  font: string;
  size: number;
  text: string;
}

/**
 * The text an uncompressed PDF (pdfkit with `compress: false`) shows, run by run in page order:
 * each TJ's hex glyph ids decoded through the ToUnicode map of the font selected before it.
 */
function pdfTextRuns(pdf: Buffer): TextRun[] {
  const raw = pdf.toString('latin1');
  const objects = new Map<string, string>();
  for (const m of raw.matchAll(/(\d+) 0 obj\s*([\s\S]*?)endobj/g)) objects.set(m[1], m[2]);
  const ref = (body: string, key: string) => new RegExp(`/${key} (\\d+) 0 R`).exec(body)?.[1] ?? '';
  const toUnicode = (cmapRef: string) => {
    const map = new Map<string, string>();
    for (const range of (objects.get(cmapRef) ?? '').matchAll(/<([0-9a-f]{4})> <([0-9a-f]{4})> \[([^\]]*)\]/gi)) {
      const start = parseInt(range[1], 16);
      [...range[3].matchAll(/<([0-9a-f]+)>/gi)].forEach((u, i) =>
        map.set((start + i).toString(16).padStart(4, '0'), String.fromCodePoint(parseInt(u[1], 16))),
      );
    }
    return map;
  };
  const pages = [...objects.values()].find((body) => /\/Type \/Pages\b/.test(body)) ?? '';
  const kids = [...(/\/Kids \[([^\]]*)\]/.exec(pages)?.[1] ?? '').matchAll(/(\d+) 0 R/g)].map((k) => k[1]);
  const runs: TextRun[] = [];
  for (const kid of kids) {
    const page = objects.get(kid) ?? '';
    const resources = /\/Resources <</.test(page) ? page : (objects.get(ref(page, 'Resources')) ?? '');
    const fonts = new Map(
      [...(/\/Font <<([\s\S]*?)>>/.exec(resources)?.[1] ?? '').matchAll(/\/(\w+) (\d+) 0 R/g)].map((f) => [f[1], f[2]]),
    );
    const content = /stream\r?\n([\s\S]*?)\r?\nendstream/.exec(objects.get(ref(page, 'Contents')) ?? '')?.[1] ?? '';
    let font = '';
    let size = 0;
    let glyphs = new Map<string, string>();
    for (const op of content.matchAll(/\/(\w+) ([\d.]+) Tf|\[([^\]]*)\] TJ/g)) {
      if (op[1]) {
        const fontObject = objects.get(fonts.get(op[1]) ?? '') ?? '';
        font = /\/BaseFont \/([^\s/]+)/.exec(fontObject)?.[1] ?? op[1];
        size = Number(op[2]);
        glyphs = toUnicode(ref(fontObject, 'ToUnicode'));
      } else {
        const hex = [...op[3].matchAll(/<([0-9a-f]+)>/gi)].map((x) => x[1]).join('');
        runs.push({ font, size, text: (hex.match(/.{4}/g) ?? []).map((g) => glyphs.get(g.toLowerCase()) ?? '?').join('') });
      }
    }
  }
  return runs;
}

/**
 * Words written twice in a row ("Submitted, submitted"), in reading order within each block of
 * text: consecutive runs in one font and size (the lines of a paragraph, the cells of a table).
 * A section heading and the column heading under it ("… per node" / "Node") are not one text.
 */
function doubledWords(runs: TextRun[]): string[] {
  const doubled: string[] = [];
  let previous = '';
  runs.forEach((run, i) => {
    if (i > 0 && (run.font !== runs[i - 1].font || run.size !== runs[i - 1].size)) previous = '';
    for (const raw of run.text.split(/\s+/)) {
      const word = raw.replace(/^[^\p{L}]+|[^\p{L}]+$/gu, '').toLowerCase();
      if (!raw) continue;
      if (/^\p{L}{2,}$/u.test(word) && word === previous) doubled.push(`${previous} ${word}`);
      previous = word;
    }
  });
  return doubled;
}

/** The table headings the summary prints (an outside list: a heading renamed in the PDF fails here). */
const TABLE_HEADINGS = [
  ['Node', 'Target plans', 'Infeasible', 'Node-hours', 'Fee'],
  ['Name', 'RA (J2000)', 'Dec (J2000)', 'Mag', 'Colour', 'Age (Myr)', 'Period range (d)', 'Visits', 'Node-hours', 'Feasible'],
];

describe('GET /api/proposals/:id/summary.pdf', () => {
  it('any member downloads a PDF that shows the title, the team and the target names', async () => {
    const { browser: pi, proposal } = await proposerWithDraft(h, net.cycleId, 'Printable summary');
    const coi = await addCoInvestigator(h, pi, proposal.id);
    await makeReady(
      h,
      pi,
      proposal.id,
      [net.nodeIds[0], net.nodeIds[2]],
      [target({ name: 'Star Print-1' }), target({ name: 'Star Print-2', raDeg: 10.5, decDeg: -45.25 })],
    );
    const res = await coi.browser.get(`/api/proposals/${proposal.id}/summary.pdf`).buffer(true).parse(binaryBody);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('application/pdf');
    expect(res.headers['content-disposition']).toMatch(/^attachment; filename="?proposal-\d+-summary\.pdf"?$/);
    const pdf = res.body as Buffer;
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');
    const texts = pdfTextRuns(pdf)
      .map((r) => r.text)
      .join('\n');
    expect(texts).toContain('Printable summary');
    expect(texts).toContain('Star Print-1');
    expect(texts).toContain('00:42:00.0');
    expect(texts).toContain('−45:15:00');
    expect(texts).toContain('Targets on');
    // The product's one date format: day, 24-hour time, UTC written once.
    expect(texts).toMatch(/Generated by Spincycle at \d{1,2} [A-Z][a-z]{2} \d{4}, \d\d:\d\d UTC\./);
    expect(texts).toContain('Draft. Category: Open clusters.');
  });

  it('submitted: the state line says it once with its date; no word is doubled and every heading word is whole', async () => {
    const { browser: pi, proposal } = await proposerWithDraft(h, net.cycleId, 'Printed once');
    await makeReady(
      h,
      pi,
      proposal.id,
      [net.nodeIds[0], net.nodeIds[2]],
      [target({ name: 'Star Whole-1' }), target({ name: 'Star Whole-2', raDeg: 10.5, decDeg: -45.25 })],
    );
    expect((await pi.post(`/api/proposals/${proposal.id}/submit`)).status).toBe(200);
    const res = await pi.get(`/api/proposals/${proposal.id}/summary.pdf`).buffer(true).parse(binaryBody);
    expect(res.status).toBe(200);
    const runs = pdfTextRuns(res.body as Buffer);
    const texts = runs.map((r) => r.text).join('\n');

    expect(texts).toMatch(/^Submitted on \d{1,2} [A-Z][a-z]{2} \d{4}, \d\d:\d\d UTC\. Category: Open clusters\.$/m);
    expect(doubledWords(runs)).toEqual([]);

    // Table headings are the only bold 8 pt text. A heading may wrap at its spaces, never inside
    // a word: every piece printed is a whole heading word, and every heading word is printed.
    const headingWords = new Set(TABLE_HEADINGS.flat().flatMap((title) => title.split(' ')));
    const printed = runs
      .filter((r) => /bold/i.test(r.font) && r.size === 8)
      .flatMap((r) => r.text.split(/\s+/))
      .filter(Boolean);
    expect(printed.filter((word) => !headingWords.has(word))).toEqual([]);
    expect([...headingWords].filter((word) => !printed.includes(word))).toEqual([]);
    // Both per-node tables print their full heading row.
    expect(printed.filter((word) => word === 'Feasible')).toHaveLength(2);
  });
});
