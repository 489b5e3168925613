/**
 * Uploads are refused before their body is read: the access check (proposal exists, the
 * caller is on its team, it is editable) runs before the multipart parser, which would
 * otherwise buffer up to 10 MB per request. The requests here declare a large body and send
 * only its first kilobyte: an answer can only come from a server that decided without it.
 */
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { Browser, signedIn, startHarness, type Harness } from '../support/api-harness';
import { createTestNetwork, proposerWithDraft, tinyPdf, type TestNetwork } from './support/proposal-kit';

let h: Harness;
let net: TestNetwork;
let server: http.Server;
let port: number;

beforeAll(async () => {
  h = await startHarness();
  net = await createTestNetwork(h, 'U');
  server = http.createServer(h.created.app);
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  port = (server.address() as AddressInfo).port;
});
afterAll(async () => {
  server.closeAllConnections();
  await new Promise((resolve) => server.close(resolve));
  await net.cleanUp();
  await h.close();
});

const DECLARED_BYTES = 9 * 1024 * 1024;
const BOUNDARY = '----spincycle-upload-test';

/**
 * Sends the headers of a multipart upload declaring DECLARED_BYTES and the first kilobyte of
 * the body, then nothing more. Resolves with the answer's status and body if one comes while
 * the rest of the body is still owed; `'no answer'` if none came within two seconds (the old
 * behaviour: the parser waits for the whole file before anything is decided).
 */
async function partialUpload(
  browser: Browser,
  method: 'POST' | 'PUT',
  path: string,
  filename: string,
): Promise<{ status: number; body: { code?: string } } | 'no answer'> {
  await browser.ready();
  const cookie = ['spincycle.sid', 'XSRF-TOKEN']
    .map((name) => browser.agent.jar.getCookie(name, { domain: '127.0.0.1', path: '/', secure: false, script: false }))
    .filter((c) => c)
    .map((c) => `${c!.name}=${c!.value}`)
    .join('; ');
  const head = Buffer.from(
    `--${BOUNDARY}\r\nContent-Disposition: form-data; name="file"; filename="${filename}"\r\nContent-Type: application/octet-stream\r\n\r\n`,
  );
  const firstKilobyte = Buffer.concat([head, tinyPdf(), Buffer.alloc(1024, 0x20)]);
  return new Promise((resolve, reject) => {
    const req = http.request({
      host: '127.0.0.1',
      port,
      method,
      path,
      headers: {
        cookie,
        'x-xsrf-token': browser.xsrf() ?? '',
        'content-type': `multipart/form-data; boundary=${BOUNDARY}`,
        'content-length': String(DECLARED_BYTES),
      },
    });
    const wait = setTimeout(() => {
      req.destroy();
      resolve('no answer');
    }, 2000);
    req.on('response', (res) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => {
        clearTimeout(wait);
        req.destroy();
        resolve({ status: res.statusCode!, body: JSON.parse(Buffer.concat(chunks).toString('utf8') || '{}') });
      });
    });
    req.on('error', (err) => {
      clearTimeout(wait);
      reject(err);
    });
    req.write(firstKilobyte);
  });
}

describe('upload routes check access before reading the body', () => {
  it('a non-member’s justification PDF upload is answered 404 while most of its 9 MB body is still unsent', async () => {
    const { proposal } = await proposerWithDraft(h, net.cycleId);
    const { browser: outsider } = await signedIn(h);
    const answer = await partialUpload(outsider, 'PUT', `/api/proposals/${proposal.id}/justification`, 'big.pdf');
    expect(answer).toEqual({ status: 404, body: expect.objectContaining({ code: 'proposal_not_found' }) });
  });

  it('a non-member’s target CSV upload is answered 404 while most of its body is still unsent', async () => {
    const { proposal } = await proposerWithDraft(h, net.cycleId);
    const { browser: outsider } = await signedIn(h);
    const answer = await partialUpload(outsider, 'POST', `/api/proposals/${proposal.id}/targets/upload`, 'big.csv');
    expect(answer).toEqual({ status: 404, body: expect.objectContaining({ code: 'proposal_not_found' }) });
  });

  it('an upload to a proposal that does not exist is the same 404, also before the body', async () => {
    const { browser } = await signedIn(h);
    const answer = await partialUpload(browser, 'PUT', '/api/proposals/2147483000/justification', 'big.pdf');
    expect(answer).toEqual({ status: 404, body: expect.objectContaining({ code: 'proposal_not_found' }) });
  });

  it('a team member’s upload to a proposal that is no longer editable is answered 409 before the body', async () => {
    const { browser, proposal } = await proposerWithDraft(h, net.cycleId);
    await h.created.ctx.db('proposals').where({ id: proposal.id }).update({ state: 'submitted', submitted_at: new Date() });
    const answer = await partialUpload(browser, 'POST', `/api/proposals/${proposal.id}/targets/upload`, 'big.csv');
    expect(answer).toEqual({ status: 409, body: expect.objectContaining({ code: 'not_editable' }) });
  });

  it('a team member’s upload to their draft is still read in full (the parser waits for the body)', async () => {
    const { browser, proposal } = await proposerWithDraft(h, net.cycleId);
    expect(await partialUpload(browser, 'PUT', `/api/proposals/${proposal.id}/justification`, 'big.pdf')).toBe('no answer');
    // Not a sign-in problem of the raw request: the same account and cookies can read their proposal.
    expect((await browser.get(`/api/proposals/${proposal.id}`)).status).toBe(200);
  });
});
