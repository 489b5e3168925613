import { createHash } from 'node:crypto';
import { startHarness, type Harness } from '../../../../../test/support/api-harness';
import {
  addCoInvestigator,
  binaryBody,
  countRows,
  createTestNetwork,
  proposerWithDraft,
  tinyPdf,
  uploadFile,
  type TestNetwork,
} from '../../../../../test/api/support/proposal-kit';
import { cleanFilename, looksLikePdf } from './justification-service';

let h: Harness;
let net: TestNetwork;
beforeAll(async () => {
  h = await startHarness();
  net = await createTestNetwork(h, 'JU');
});
afterAll(async () => {
  await net.cleanUp();
  await h.close();
});

describe('PUT/GET /api/proposals/:id/justification', () => {
  it('stores a PDF with its SHA-256 (any member), replaces it on a new upload, and downloads it back byte for byte', async () => {
    const { browser: pi, proposal } = await proposerWithDraft(h, net.cycleId);
    const coi = await addCoInvestigator(h, pi, proposal.id);
    const pdf = tinyPdf('first version');
    const res = await uploadFile(pi, 'put', `/api/proposals/${proposal.id}/justification`, pdf, 'Justification – Lantern.pdf');
    expect(res.status).toBe(200);
    expect(res.body).toEqual({
      filename: 'Justification – Lantern.pdf',
      sizeBytes: pdf.length,
      sha256: createHash('sha256').update(pdf).digest('hex'),
      uploadedAt: expect.any(String),
      uploadedBy: expect.any(String),
    });
    const second = tinyPdf('second version, by the co-I');
    expect((await uploadFile(coi.browser, 'put', `/api/proposals/${proposal.id}/justification`, second, 'v2.pdf')).status).toBe(200);
    expect(await countRows(h, 'proposal_files', { proposal_id: proposal.id })).toBe(1);
    const got = await pi.get(`/api/proposals/${proposal.id}/justification`).buffer(true).parse(binaryBody);
    expect(got.status).toBe(200);
    expect(got.headers['content-type']).toBe('application/pdf');
    expect(got.headers['content-disposition']).toMatch(/^attachment; filename="?v2\.pdf"?$/);
    expect(Buffer.compare(got.body as Buffer, second)).toBe(0);
    expect((await pi.get(`/api/proposals/${proposal.id}`)).body.justification.filename).toBe('v2.pdf');
  });

  it('judges by content: a PDF declared as text/plain with another name is accepted; a non-PDF named .pdf is 415 naming it', async () => {
    const { browser, proposal } = await proposerWithDraft(h, net.cycleId);
    const disguised = await uploadFile(browser, 'put', `/api/proposals/${proposal.id}/justification`, tinyPdf(), 'notes.txt', {
      contentType: 'text/plain',
    });
    expect(disguised.status).toBe(200);
    const fake = await uploadFile(
      browser,
      'put',
      `/api/proposals/${proposal.id}/justification`,
      Buffer.from('PK\u0003\u0004 a word document, not a PDF'),
      'justification.pdf',
    );
    expect(fake.status).toBe(415);
    expect(fake.body).toMatchObject({ code: 'not_a_pdf', message: expect.stringContaining('“justification.pdf” is not a PDF') });
    const truncated = tinyPdf().subarray(0, 60);
    expect((await uploadFile(browser, 'put', `/api/proposals/${proposal.id}/justification`, truncated, 'cut.pdf')).body.code).toBe(
      'not_a_pdf',
    );
    // Stored under the type found in the content: the extension follows (see cleanFilename).
    expect((await browser.get(`/api/proposals/${proposal.id}`)).body.justification.filename).toBe('notes.pdf');
  });

  it('refuses a file over 10 MB with 413 file_too_large in the API error shape; nothing stored', async () => {
    const { browser, proposal } = await proposerWithDraft(h, net.cycleId);
    const big = Buffer.concat([Buffer.from('%PDF-1.4\n'), Buffer.alloc(10 * 1024 * 1024 + 10, 32), Buffer.from('\n%%EOF\n')]);
    const res = await uploadFile(browser, 'put', `/api/proposals/${proposal.id}/justification`, big, 'huge.pdf');
    expect(res.status).toBe(413);
    expect(res.body).toEqual({
      code: 'file_too_large',
      message: 'The justification PDF is larger than 10 MB',
      fieldErrors: { file: ['The justification PDF is larger than 10 MB'] },
    });
    expect(await countRows(h, 'proposal_files', { proposal_id: proposal.id })).toBe(0);
  });

  it('without a file answers 400 file_missing; before any upload GET answers 404', async () => {
    const { browser, proposal } = await proposerWithDraft(h, net.cycleId);
    const res = await browser.put(`/api/proposals/${proposal.id}/justification`, {});
    expect(res.status).toBe(400);
    expect(res.body.code).toBe('file_missing');
    const none = await browser.get(`/api/proposals/${proposal.id}/justification`);
    expect(none.status).toBe(404);
    expect(none.body.code).toBe('justification_not_found');
  });
});

describe('looksLikePdf and cleanFilename', () => {
  it('looksLikePdf wants %PDF- first and %%EOF in the last kilobyte', () => {
    expect(looksLikePdf(tinyPdf())).toBe(true);
    expect(looksLikePdf(Buffer.concat([tinyPdf(), Buffer.alloc(2000, 10)]))).toBe(false);
    expect(looksLikePdf(Buffer.from(' %PDF-1.4 ... %%EOF'))).toBe(false);
  });

  it('cleanFilename drops paths and control characters and never returns an empty name', () => {
    expect(cleanFilename('C:\\Users\\x\\plan.pdf')).toBe('plan.pdf');
    // The stored name always carries the extension of the type found in the content.
    expect(cleanFilename('../../etc/passwd')).toBe('passwd.pdf');
    expect(cleanFilename('a\u0000b\n"c".pdf')).toBe('abc.pdf');
    expect(cleanFilename('')).toBe('justification.pdf');
  });
});
