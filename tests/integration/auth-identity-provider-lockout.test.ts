import { createServer, type Server } from 'node:http';
import { afterEach, describe, expect, it } from 'vitest';
import { createIdentityProviderApp } from '@ratewarden/api/stand-ins/identity-provider/app';
import { readIdpConfig } from '@ratewarden/api/stand-ins/identity-provider/config';
import { createProvider } from '@ratewarden/api/stand-ins/identity-provider/provider';
import { freePort } from '../support/free-port';
import { DEMO_PASSWORD } from '../support/sign-in';

/**
 * The local identity provider limits password guesses like a hosted one: per account and per
 * address, with a lockout for the rest of the window. Each test runs its own instance (the shared
 * one serves every other test from the same address).
 */
describe('password guesses at the local identity provider', () => {
  let server: Server | undefined;
  afterEach(async () => {
    server?.closeAllConnections();
    await new Promise((r) => server?.close(r));
  });

  async function startIdp(perAccount: number, perAddress: number): Promise<string> {
    const port = await freePort();
    const config = readIdpConfig({
      IDP_PORT: String(port),
      IDP_FAILED_SIGN_INS_PER_ACCOUNT: String(perAccount),
      IDP_FAILED_SIGN_INS_PER_ADDRESS: String(perAddress),
    });
    const app = createIdentityProviderApp(config, await createProvider(config));
    server = createServer(app);
    await new Promise<void>((resolve) => server!.listen(port, '127.0.0.1', resolve));
    return config.issuer;
  }

  /** Opens a sign-in (authorization request) and returns its form's address with the interaction cookies. */
  async function openSignIn(issuer: string): Promise<{ action: URL; cookie: string }> {
    const auth = new URL('/auth', issuer);
    auth.search = new URLSearchParams({
      client_id: 'ratewarden-web',
      redirect_uri: 'http://127.0.0.1:3000/auth/callback',
      response_type: 'code',
      scope: 'openid email',
      state: 's',
      nonce: 'n',
    }).toString();
    const res = await fetch(auth, { redirect: 'manual' });
    expect(res.status).toBe(303);
    const cookie = res.headers
      .getSetCookie()
      .map((c) => c.split(';')[0])
      .join('; ');
    return { action: new URL(`${res.headers.get('location')!}/login`, issuer), cookie };
  }

  const attempt = async (form: { action: URL; cookie: string }, email: string, password: string) => {
    const res = await fetch(form.action, {
      method: 'POST',
      redirect: 'manual',
      headers: { cookie: form.cookie, 'content-type': 'application/x-www-form-urlencoded' },
      body: new URLSearchParams({ email, password }),
    });
    return { status: res.status, page: await res.text() };
  };

  it('locks an account after its limit of wrong passwords, even against the right one, and only that account', async () => {
    const issuer = await startIdp(3, 100);
    const form = await openSignIn(issuer);
    const guesses = await Promise.all(Array.from({ length: 40 }, (_, i) => attempt(form, 'physician@demo.ratewarden.test', `guess-${i}`)));
    expect(guesses.filter((g) => g.status === 401)).toHaveLength(3);
    expect(guesses.filter((g) => g.status === 429)).toHaveLength(37);
    const locked = await attempt(form, 'PHYSICIAN@demo.ratewarden.test', DEMO_PASSWORD);
    expect(locked.status).toBe(429);
    expect(locked.page).toMatch(/Too many wrong passwords for this account/);
    expect((await attempt(await openSignIn(issuer), 'hygienist@demo.ratewarden.test', DEMO_PASSWORD)).status).toBe(303);
  });

  it('locks an address that tries many accounts', async () => {
    const issuer = await startIdp(3, 5);
    const form = await openSignIn(issuer);
    const statuses: number[] = [];
    for (let i = 0; i < 7; i++) statuses.push((await attempt(form, `someone-${i}@demo.ratewarden.test`, 'wrong-password')).status);
    expect(statuses).toEqual([401, 401, 401, 401, 401, 429, 429]);
    const locked = await attempt(await openSignIn(issuer), 'hygienist@demo.ratewarden.test', DEMO_PASSWORD);
    expect(locked.status).toBe(429);
    expect(locked.page).toMatch(/from this address/);
  });

  it('does not count successful sign-ins', async () => {
    const issuer = await startIdp(2, 2);
    for (let i = 0; i < 4; i++) expect((await attempt(await openSignIn(issuer), 'safety@demo.ratewarden.test', DEMO_PASSWORD)).status).toBe(303);
  });
});
