import { passIdentityProvider } from '../../tests/support/sign-in';

/** A signed-in person's session as a browser holds it: the session cookie, and the CSRF token for writes. */
export interface BenchSession {
  email: string;
  cookie: string;
  csrf: string;
  /** Headers for a state-changing request (an intake upload or apply). */
  writeHeaders: Record<string, string>;
}

function sessionCookie(res: Response, previous: string): string {
  for (const c of res.headers.getSetCookie()) {
    const [pair] = c.split(';');
    if (pair?.startsWith('rw.sid=')) return pair;
  }
  return previous;
}

/**
 * Signs a person in to a running API through the real OpenID Connect round trip, as a browser
 * would: the API's /auth/login, the identity provider's sign-in form (the same walk as the
 * integration tests, tests/support/sign-in.ts), the API's callback; then reads /api/session for
 * the CSRF token. The person must be known to the identity provider (its demo accounts).
 */
export async function signInToServer(apiUrl: string, email: string): Promise<BenchSession> {
  const login = await fetch(new URL('/auth/login', apiUrl), { redirect: 'manual' });
  if (login.status !== 302) throw new Error(`/auth/login answered ${login.status}`);
  let cookie = sessionCookie(login, '');
  const callback = await passIdentityProvider(new URL(login.headers.get('location')!, apiUrl), email);
  const back = await fetch(new URL(`${callback.pathname}${callback.search}`, apiUrl), { redirect: 'manual', headers: { cookie } });
  if (back.status !== 302) throw new Error(`the sign-in callback answered ${back.status}: ${(await back.text()).slice(0, 200)}`);
  cookie = sessionCookie(back, cookie);
  const session = await fetch(new URL('/api/session', apiUrl), { headers: { cookie } });
  const body = (await session.json()) as { user?: { email: string } | null; csrfToken?: string };
  if (!body.user || !body.csrfToken) throw new Error(`sign-in of ${email} did not produce a session`);
  return { email, cookie, csrf: body.csrfToken, writeHeaders: { cookie, 'x-csrf-token': body.csrfToken } };
}
