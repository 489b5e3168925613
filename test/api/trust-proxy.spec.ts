import { loadConfig } from '../../server/src/config';
import { Browser, createAccount, startHarness, type Harness } from '../support/api-harness';

/** Review finding 7: the login limiter believed X-Forwarded-For from any loopback client. */

async function failedSignIns(h: Harness, email: string, forwardedFor: (i: number) => string, count: number): Promise<number[]> {
  const b = await new Browser(h).ready();
  const codes: number[] = [];
  for (let i = 0; i < count; i++) {
    const res = await b.agent
      .post('/api/auth/sign-in')
      .set('X-XSRF-TOKEN', b.xsrf() ?? '')
      .set('X-Forwarded-For', forwardedFor(i))
      .send({ email, password: 'not the password' });
    codes.push(res.status);
  }
  return codes;
}

describe('TRUST_PROXY and the login rate limiter', () => {
  it('by default, rotating X-Forwarded-For values does not change the client the limiter sees: still limited', async () => {
    const h = await startHarness({ LOGIN_RATE_LIMIT: 2 });
    try {
      const a = await createAccount(h);
      expect(h.created.app.get('trust proxy')).toBe(false);
      expect(await failedSignIns(h, a.email, (i) => `203.0.113.${i + 1}`, 4)).toEqual([401, 401, 429, 429]);
    } finally {
      await h.close();
    }
  });

  it('with TRUST_PROXY=loopback, a proxy on loopback names the client (each forwarded address has its own count)', async () => {
    const h = await startHarness({ LOGIN_RATE_LIMIT: 2, TRUST_PROXY: ['loopback'] });
    try {
      const a = await createAccount(h);
      expect(await failedSignIns(h, a.email, (i) => `203.0.113.${i + 1}`, 4)).toEqual([401, 401, 401, 401]);
      expect(await failedSignIns(h, a.email, () => '198.51.100.7', 3)).toEqual([401, 401, 429]);
    } finally {
      await h.close();
    }
  });
});

describe('TRUST_PROXY parsing', () => {
  const parse = (value: string | undefined) => loadConfig({ TRUST_PROXY: value }).TRUST_PROXY;
  it.each([
    [undefined, false],
    ['', false],
    ['false', false],
    ['off', false],
    ['0', false],
    ['1', 1],
    ['loopback', ['loopback']],
    [' loopback, 10.0.0.0/8 ,::1 ', ['loopback', '10.0.0.0/8', '::1']],
  ])('%p → %p', (value, parsed) => {
    expect(parse(value)).toEqual(parsed);
  });

  it.each(['true', '*', 'proxy.example', '10.0.0.0/8,nonsense'])('refuses %p, naming the variable', (value) => {
    expect(() => parse(value)).toThrow(/TRUST_PROXY/);
  });
});
