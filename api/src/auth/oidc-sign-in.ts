import passportModule from 'passport';
import { Strategy, type Profile } from 'passport-openidconnect';
import type { DataSource } from 'typeorm';
import type { ApiConfig } from '../config';
import { discover } from './discovery';
import { accountForSignIn } from './user-accounts';

export interface SignedIn {
  userId: string;
  idToken: string;
  created: boolean;
}

/**
 * A passport instance with the OpenID Connect strategy, configured from the issuer's discovery
 * document on first use (so the API can start before the identity provider). Authorization code
 * flow with state and nonce; the client authenticates with client_secret_post.
 */
export function createOidcPassport(ds: DataSource, config: ApiConfig): { passport: InstanceType<typeof passportModule.Passport>; ready: () => Promise<void> } {
  const passport = new passportModule.Passport();
  let configured: Promise<void> | undefined;
  const ready = () => {
    configured ??= discover(config.OIDC_ISSUER)
      .then((m) => {
        const strategy = new Strategy(
          {
            issuer: m.issuer,
            authorizationURL: m.authorization_endpoint,
            tokenURL: m.token_endpoint,
            userInfoURL: m.userinfo_endpoint,
            clientID: config.OIDC_CLIENT_ID,
            clientSecret: config.OIDC_CLIENT_SECRET,
            callbackURL: config.OIDC_REDIRECT_URI,
            scope: ['openid', 'profile', 'email'],
            skipUserProfile: false,
            nonce: true,
          } as unknown as ConstructorParameters<typeof Strategy>[0],
          // Five parameters: the strategy passes the ID token only to a verify function of this arity.
          ((issuer: string, profile: Profile, _context: unknown, idToken: string, done: (err: unknown, user?: SignedIn) => void) => {
            const email = profile.emails?.[0]?.value;
            if (!email) return done(new Error('the identity provider sent no e-mail claim'));
            accountForSignIn(ds, { subject: `${issuer}|${profile.id}`, email, name: profile.displayName || email })
              .then(({ user, created }) => done(null, { userId: user.id, idToken, created }))
              .catch(done);
          }) as unknown as ConstructorParameters<typeof Strategy>[1],
        );
        passport.use('oidc', strategy);
      })
      .catch((err: unknown) => {
        configured = undefined;
        throw err;
      });
    return configured;
  };
  return { passport, ready };
}
