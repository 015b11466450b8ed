import type { Express } from 'express';
import request from 'supertest';
import type TestAgent from 'supertest/lib/agent';
import type { DataSource } from 'typeorm';
import type { Role } from '@ratewarden/shared/domain';

export const DEMO_PASSWORD = 'demo-password';

/** Cookie jar for the identity provider's side of the round trip. */
class Jar {
  private cookies = new Map<string, string>();
  take(res: Response): void {
    for (const c of res.headers.getSetCookie()) {
      const [pair] = c.split(';');
      const i = pair!.indexOf('=');
      this.cookies.set(pair!.slice(0, i), pair!.slice(i + 1));
    }
  }
  header(): string {
    return [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; ');
  }
}

export interface SignedInAgent {
  agent: InstanceType<typeof TestAgent>;
  csrf: string;
  /** Where the app sent the browser after the callback. */
  landing: string;
}

/**
 * Signs a demo person in through the real OpenID Connect round trip: the app's /auth/login, the
 * identity provider's sign-in form, and back to the app's callback, all without a browser.
 */
export async function signIn(app: Express, email: string, password = DEMO_PASSWORD, returnTo?: string): Promise<SignedInAgent> {
  const agent = request.agent(app);
  const login = await agent.get(returnTo === undefined ? '/auth/login' : `/auth/login?returnTo=${encodeURIComponent(returnTo)}`).expect(302);
  const callback = await passIdentityProvider(new URL(login.headers.location as string), email, password);
  const back = await agent.get(`${callback.pathname}${callback.search}`).expect(302);
  const session = await agent.get('/api/session').expect(200);
  if (!session.body.user) throw new Error(`sign-in of ${email} did not produce a session`);
  return { agent, csrf: session.body.csrfToken as string, landing: back.headers.location as string };
}

/**
 * The identity provider's side of the round trip: from its authorization address through its
 * sign-in form to the app's callback address (returned, not visited).
 */
export async function passIdentityProvider(authorization: URL, email: string, password = DEMO_PASSWORD): Promise<URL> {
  const jar = new Jar();
  let url = authorization;
  for (let hop = 0; hop < 12; hop++) {
    const res = await fetch(url, { redirect: 'manual', headers: { cookie: jar.header() } });
    jar.take(res);
    if (res.status >= 300 && res.status < 400) {
      const next = new URL(res.headers.get('location')!, url);
      if (next.pathname === '/auth/callback') return next;
      url = next;
      continue;
    }
    const html = await res.text();
    const action = /<form method="post" action="([^"]+)"/.exec(html)?.[1];
    if (!action) throw new Error(`unexpected page from the identity provider (${res.status}): ${html.slice(0, 200)}`);
    const posted = await fetch(new URL(action, url), {
      method: 'POST',
      redirect: 'manual',
      headers: { cookie: jar.header(), 'content-type': 'application/x-www-form-urlencoded' },
      body: new URLSearchParams({ email, password }),
    });
    jar.take(posted);
    if (posted.status === 401) throw new Error(`the identity provider refused ${email}`);
    url = new URL(posted.headers.get('location')!, url);
  }
  throw new Error('sign-in did not finish within 12 redirects');
}

/** Gives a person a role and sites (as an administrator would), whether or not they have signed in before. */
export async function provisionUser(ds: DataSource, email: string, role: Role | null, siteIds: number[] = []): Promise<string> {
  const existing = (await ds.query(`SELECT id FROM users WHERE lower(email) = lower($1)`, [email])) as { id: string }[];
  const id = existing[0]
    ? existing[0].id
    : ((await ds.query(`INSERT INTO users (email, name, role) VALUES ($1, $1, $2) RETURNING id`, [email, role])) as { id: string }[])[0]!.id;
  await ds.query(`UPDATE users SET role = $2 WHERE id = $1`, [id, role]);
  await ds.query(`DELETE FROM user_sites WHERE user_id = $1`, [id]);
  if (siteIds.length) await ds.query(`INSERT INTO user_sites (user_id, site_id) SELECT $1, unnest($2::int[])`, [id, siteIds]);
  return id;
}

/** Access token for the demo HR integration client, straight from the identity provider. */
export async function clientToken(issuer: string, clientId = 'hr-sync-demo', secret = 'demo-secret'): Promise<string> {
  const res = await fetch(new URL('/token', issuer), {
    method: 'POST',
    headers: { authorization: `Basic ${Buffer.from(`${clientId}:${secret}`).toString('base64')}`, 'content-type': 'application/x-www-form-urlencoded' },
    body: new URLSearchParams({ grant_type: 'client_credentials', scope: 'intake:write' }),
  });
  if (!res.ok) throw new Error(`token request failed: ${res.status} ${await res.text()}`);
  return ((await res.json()) as { access_token: string }).access_token;
}
