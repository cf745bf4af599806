// The account page in the browser: an API token made with a scope and an expiry (shown when made
// and in the list, and a read-only token refused a change), and a password change that signs the
// person's other browser out and, with its box ticked, revokes their tokens. Then sign-out, audited.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { resetDatabase, testDb } from '../support/database';
import { makeUser, PASSWORD } from '../support/people';
import { closeBrowser, openBrowser, startApp, submitSignIn, type BrowserSession, type RunningApp } from './harness';

let app: RunningApp;
const EMAIL = 'tokens@example.test';
const NEW_PASSWORD = 'a brand new password for tokens';

beforeAll(async () => {
  await resetDatabase();
  await makeUser(testDb(), EMAIL);
  app = await startApp();
});

afterAll(async () => {
  await closeBrowser();
  await app?.stop();
});

async function signIn(): Promise<BrowserSession> {
  const session = await openBrowser();
  await submitSignIn(session.page, app.baseUrl, EMAIL, PASSWORD);
  await session.page.waitForURL((url) => !url.pathname.startsWith('/sign-in'));
  return session;
}

function bearer(token: string, init: RequestInit = {}): Promise<Response> {
  return fetch(`${app.baseUrl}/api/account`, {
    ...init,
    headers: { authorization: `Bearer ${token}`, ...init.headers },
  });
}

describe('API tokens and the password on the account page', () => {
  it('makes a read-only token with a chosen expiry, and a password change with the box ticked ends the other session and revokes the tokens', async () => {
    const here = await signIn();
    const elsewhere = await signIn();
    const { page } = here;
    try {
      await page.goto(`${app.baseUrl}/account`);
      await page.getByRole('heading', { level: 1, name: 'Your account' }).waitFor();

      // A read-only token for 7 days.
      await page.getByLabel('Token name').fill('nightly export');
      await page.getByLabel('Read only').check();
      await page.getByLabel('Expires after').selectOption('7');
      await page.getByRole('button', { name: 'Create a token' }).click();
      const secret = (await page.locator('code', { hasText: /^wst_/ }).innerText()).trim();
      expect(secret).toMatch(/^wst_[A-Za-z0-9_-]{43}$/);
      const stored = await testDb()
        .selectFrom('api_tokens')
        .select(['id', 'scope', 'expires_at', 'created_at'])
        .where('name', '=', 'nightly export')
        .executeTakeFirstOrThrow();
      expect(stored.scope).toBe('read');
      expect(Math.round((stored.expires_at.getTime() - stored.created_at.getTime()) / 86_400_000)).toBe(7);
      const expires = `${stored.expires_at.toISOString().slice(0, 10)} ${stored.expires_at.toISOString().slice(11, 16)} UTC`;
      expect(
        await page
          .getByText(/Copy this token now/)
          .locator('..')
          .innerText(),
      ).toContain(`read only; expires ${expires}`);
      const row = page.getByRole('row', { name: /nightly export/ });
      await row.getByText(expires).waitFor();
      expect(await row.innerText()).toContain('read only');

      // It reads as its owner, and may not change anything.
      expect((await (await bearer(secret)).json()).via).toBe('token');
      const write = await fetch(`${app.baseUrl}/api/account/tokens/${stored.id}`, {
        method: 'DELETE',
        headers: { authorization: `Bearer ${secret}` },
      });
      expect(write.status).toBe(403);

      // A read-and-write token with the default lifetime.
      await page.getByLabel('Token name').fill('deploy hook');
      await page.getByLabel(/Read and write/).check();
      await page.getByRole('button', { name: 'Create a token' }).click();
      await page
        .getByRole('row', { name: /deploy hook/ })
        .getByText('read and write')
        .waitFor();
      const second = (await page.locator('code', { hasText: /^wst_/ }).innerText()).trim();
      expect(second).not.toBe(secret);
      expect((await bearer(second)).status).toBe(200);

      // The password change, revoking the tokens.
      await page.getByLabel('Current password').fill(PASSWORD);
      await page.getByLabel('New password').fill(NEW_PASSWORD);
      await page.getByLabel('Also revoke all my API tokens').check();
      await page.getByRole('button', { name: 'Change the password' }).click();
      await page.getByText('Your password is changed. Your other sessions are signed out.').waitFor();
      expect((await bearer(secret)).status).toBe(401);
      expect((await bearer(second)).status).toBe(401);
      await page.reload();
      await page
        .getByRole('row', { name: /nightly export/ })
        .getByText('revoked')
        .waitFor();
      await page
        .getByRole('row', { name: /deploy hook/ })
        .getByText('revoked')
        .waitFor();

      // The other browser is signed out; this one goes on.
      await elsewhere.page.goto(`${app.baseUrl}/account`);
      await elsewhere.page.waitForURL(/\/sign-in\?callbackUrl=%2Faccount$/);
      const change = await testDb()
        .selectFrom('audit_events')
        .select('new_value')
        .where('action', '=', 'user.password-change')
        .executeTakeFirstOrThrow();
      expect(change.new_value).toEqual({ endedSessions: 1, revokedTokens: 2, tokensRevokeAsked: true });

      // Sign-out is audited.
      await page.getByRole('button', { name: 'Sign out' }).click();
      await page.getByRole('link', { name: 'Sign in' }).waitFor();
      const signOuts = await testDb()
        .selectFrom('audit_events')
        .select(['object_type'])
        .where('action', '=', 'auth.sign-out')
        .execute();
      expect(signOuts).toEqual([{ object_type: 'session' }]);
      // The only HTTP errors are the refusals this test asked for (fetch is outside the page).
      expect(here.problems).toEqual([]);
    } finally {
      await here.close();
      await elsewhere.close();
    }
  });
});
