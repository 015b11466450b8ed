import { timingSafeEqual } from 'node:crypto';

/** People of the invented demo company, known to the stand-in identity provider. */
export interface DemoAccount {
  sub: string;
  email: string;
  name: string;
}

export const DEMO_PASSWORD = 'demo-password';

export const demoAccounts: DemoAccount[] = [
  { sub: 'kc-0001', email: 'hygienist@demo.ratewarden.test', name: 'Ines Varga' },
  { sub: 'kc-0002', email: 'safety@demo.ratewarden.test', name: 'Tomas Okafor' },
  { sub: 'kc-0003', email: 'physician@demo.ratewarden.test', name: 'Dr Mirela Santos' },
  { sub: 'kc-0004', email: 'admin@demo.ratewarden.test', name: 'Pavel Lindqvist' },
  // Known to the identity provider but given no role in Ratewarden: shows the "ask an administrator" page.
  { sub: 'kc-0005', email: 'newcomer@demo.ratewarden.test', name: 'Ade Novak' },
];

/** Checks an e-mail and password; constant-time on the password so timing reveals nothing. */
export function checkCredentials(email: string, password: string): DemoAccount | undefined {
  const account = demoAccounts.find((a) => a.email === email.trim().toLowerCase());
  const given = Buffer.from(password);
  const expected = Buffer.from(DEMO_PASSWORD);
  const ok = given.length === expected.length && timingSafeEqual(given, expected);
  return account && ok ? account : undefined;
}
