import type { Browser } from 'playwright-core';
import demo from '../../database/demo-accounts.json';
import { axeViolations, describeViolations, launchBrowser, newPage, screenshot } from './support/browser';
import { e2eMailboxUrl } from './support/e2e-env';
import { signIn } from './support/session';

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(() => browser?.close());

describe('each demo account', () => {
  it.each(demo.accounts.map((a) => [a.email.split('@')[0], a]))('%s signs in and sees its own home, accessible', async (role, account) => {
    const { context, page } = await newPage(browser);
    try {
      await signIn(page, account.email);
      await page.getByRole('heading', { level: 1 }).first().waitFor();
      await page.getByText(account.displayName).first().waitFor();
      // The open demo cycle is on every home page.
      await page
        .getByText(/Spin-down monitoring/)
        .first()
        .waitFor();
      await page.waitForLoadState('networkidle');
      await screenshot(page, `home-${role}`);
      const violations = await axeViolations(page);
      expect(describeViolations(violations)).toBe('');
    } finally {
      await context.close();
    }
  });
});

describe('role-aware navigation', () => {
  it('an administrator reaches the account table; a proposer is turned away from it', async () => {
    const admin = await newPage(browser);
    try {
      await signIn(admin.page, 'admin@halcyon.example');
      await admin.page.goto('/admin/accounts');
      await admin.page.getByRole('cell', { name: 'proposer@halcyon.example' }).waitFor();
      await admin.page.waitForLoadState('networkidle');
      await screenshot(admin.page, 'admin-accounts');
      expect(describeViolations(await axeViolations(admin.page))).toBe('');
    } finally {
      await admin.context.close();
    }
    const proposer = await newPage(browser);
    try {
      await signIn(proposer.page, 'proposer@halcyon.example');
      await expect(proposer.page.getByRole('link', { name: /accounts/i }).count()).resolves.toBe(0);
      await proposer.page.goto('/admin/accounts');
      await proposer.page.waitForURL((url) => url.pathname === '/');
    } finally {
      await proposer.context.close();
    }
  });

  it('the network page lists the three demo nodes', async () => {
    const { context, page } = await newPage(browser);
    try {
      await signIn(page, 'reviewer@halcyon.example');
      await page.goto('/network');
      for (const code of ['KRG-50', 'VHM-40', 'PSR-100']) await page.getByRole('cell', { name: code }).first().waitFor();
      await page.waitForLoadState('networkidle');
      await screenshot(page, 'network');
      expect(describeViolations(await axeViolations(page))).toBe('');
    } finally {
      await context.close();
    }
  });
});

describe('accounts', () => {
  it('a visitor signs up, is a proposer, and can reset the password through the development mailbox', async () => {
    const email = `visitor-${Date.now()}@example.net`;
    const { context, page } = await newPage(browser);
    try {
      await page.goto('/sign-up');
      await page.getByLabel('Name', { exact: false }).first().fill('Vera Visitor');
      await page.getByLabel('E-mail').fill(email);
      await page.getByLabel('Password', { exact: true }).fill('a long enough password');
      await screenshot(page, 'sign-up');
      await page.getByRole('button', { name: /create account/i }).click();
      // The answer is the same whether or not the address has an account: check the inbox.
      await page.getByTestId('sign-up-accepted').waitFor();
      await screenshot(page, 'sign-up-accepted');
      // The welcome mail is sent after the answer: look until it has arrived.
      for (let i = 0; i < 20; i++) {
        await page.goto(e2eMailboxUrl(email));
        if ((await page.getByText(/welcome to spincycle/i).count()) > 0) break;
        await page.waitForTimeout(250);
      }
      await page
        .getByText(/welcome to spincycle/i)
        .first()
        .waitFor();
      await signIn(page, email, 'a long enough password');
      await page.getByText('Vera Visitor').first().waitFor();

      // Forgotten password: ask, read the mail in the development mailbox, follow the link.
      const anon = await newPage(browser);
      try {
        await anon.page.goto('/forgot-password');
        await anon.page.getByLabel('E-mail').fill(email);
        await anon.page.getByRole('button', { name: /send|reset/i }).click();
        await anon.page.getByText(/on its way/i).waitFor();
        // The reset mail, too, is sent after the answer.
        const resetLink = anon.page.getByRole('link', { name: /reset-password\?token=/ });
        for (let i = 0; i < 20; i++) {
          await anon.page.goto(e2eMailboxUrl(email));
          if ((await resetLink.count()) > 0) break;
          await anon.page.waitForTimeout(250);
        }
        const link = await resetLink.first().getAttribute('href');
        expect(link).toMatch(/\/reset-password\?token=/);
        await anon.page.goto(link!);
        const fields = anon.page.getByLabel(/password/i);
        await fields.nth(0).fill('the new long password');
        await fields.nth(1).fill('the new long password');
        await anon.page.getByRole('button', { name: /set|save|change|reset/i }).click();
        await anon.page.waitForURL((url) => url.pathname.startsWith('/sign-in'));
        await signIn(anon.page, email, 'the new long password');
        await anon.page.getByText('Vera Visitor').first().waitFor();
      } finally {
        await anon.context.close();
      }
    } finally {
      await context.close();
    }
  });

  it('a wrong password shows the server’s message on the sign-in page', async () => {
    const { context, page } = await newPage(browser);
    try {
      await page.goto('/sign-in');
      await page.getByLabel('E-mail').fill('proposer@halcyon.example');
      await page.getByLabel('Password', { exact: true }).fill('not the password');
      await page.getByRole('button', { name: 'Sign in', exact: true }).click();
      await page
        .getByTestId('server-error')
        .getByText(/not right/)
        .waitFor();
      await screenshot(page, 'sign-in-error');
    } finally {
      await context.close();
    }
  });
});
