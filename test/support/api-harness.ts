import { randomUUID } from 'node:crypto';
import request from 'supertest';
import type { Role } from '@spincycle/shared/accounts/roles';
import { createApp, type CreatedApp } from '../../server/src/app';
import type { AppContext } from '../../server/src/app-context';
import type { ConfigOverrides } from '../../server/src/config';
import { insertAccount } from '../../server/src/features/accounts/account-repository';
import { hashPassword } from '../../server/src/features/auth/password-hash';
import { startMailFake, type MailFake } from '../../fakes/mail/mail-fake';

export const TEST_PASSWORD = 'a test password 123';

/** An app on the test database with its own in-process SMTP fake. */
export interface Harness {
  created: CreatedApp;
  mail: MailFake;
  close(): Promise<void>;
}

export async function startHarness(config: ConfigOverrides = {}, ctx: Partial<AppContext> = {}): Promise<Harness> {
  const mail = await startMailFake({ smtpPort: 0, httpPort: null });
  const created = createApp({ config: { SMTP_PORT: mail.smtpPort, PUBLIC_URL: 'http://spincycle.test', ...config }, ctx });
  return {
    created,
    mail,
    async close() {
      await created.close();
      await mail.close();
    },
  };
}

/** A fresh account with the given roles (unique e-mail per call). */
export async function createAccount(h: Harness, roles: Role[] = ['proposer'], extra: { displayName?: string } = {}) {
  const email = `t-${randomUUID()}@test.example`;
  const id = await insertAccount(h.created.ctx.db, {
    email,
    displayName: extra.displayName ?? `Tester ${email.slice(2, 8)}`,
    affiliation: 'Test Station',
    passwordHash: await hashPassword(TEST_PASSWORD),
    roles,
  });
  return { id, email, password: TEST_PASSWORD };
}

/**
 * A supertest agent that behaves like the browser client: keeps cookies and echoes the
 * XSRF-TOKEN cookie in the X-XSRF-TOKEN header on unsafe methods.
 */
export class Browser {
  readonly agent: ReturnType<typeof request.agent>;
  constructor(h: Harness) {
    this.agent = request.agent(h.created.app);
  }

  /** The current XSRF-TOKEN cookie, which unsafe requests echo in the X-XSRF-TOKEN header. */
  xsrf(): string | undefined {
    const cookie = this.agent.jar.getCookie('XSRF-TOKEN', { domain: '127.0.0.1', path: '/', secure: false, script: true });
    return cookie?.value;
  }

  async ready(): Promise<this> {
    if (!this.xsrf()) await this.agent.get('/api/auth/session').expect(200);
    return this;
  }

  get(url: string) {
    return this.agent.get(url);
  }

  async send(method: 'post' | 'put' | 'patch' | 'delete', url: string, body?: object) {
    await this.ready();
    const req = this.agent[method](url).set('X-XSRF-TOKEN', this.xsrf() ?? '');
    return body === undefined ? req : req.send(body);
  }

  post(url: string, body?: object) {
    return this.send('post', url, body);
  }
  patch(url: string, body?: object) {
    return this.send('patch', url, body);
  }
  put(url: string, body?: object) {
    return this.send('put', url, body);
  }
  delete(url: string) {
    return this.send('delete', url);
  }

  async signIn(email: string, password = TEST_PASSWORD) {
    const res = await this.post('/api/auth/sign-in', { email, password });
    if (res.status !== 200) throw new Error(`sign-in failed: ${res.status} ${JSON.stringify(res.body)}`);
    return this;
  }
}

/** A signed-in browser for a fresh account with the roles. */
export async function signedIn(h: Harness, roles: Role[] = ['proposer']) {
  const account = await createAccount(h, roles);
  const browser = await new Browser(h).signIn(account.email);
  return { account, browser };
}
