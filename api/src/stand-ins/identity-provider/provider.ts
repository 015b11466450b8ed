import { generateKeyPair, exportJWK } from 'jose';
import Provider, { type Configuration } from 'oidc-provider';
import type { IdpConfig } from './config';
import { demoAccounts } from './demo-accounts';
import { signedOutPage, signOutPage } from './pages';

/**
 * The local stand-in for the organisation's hosted identity service: authorization code flow for
 * the web app, client credentials (JWT access tokens for the Ratewarden API) for HR integration.
 */
export async function createProvider(config: IdpConfig): Promise<Provider> {
  const { privateKey } = await generateKeyPair('RS256', { extractable: true });
  const signingKey = { ...(await exportJWK(privateKey)), alg: 'RS256', use: 'sig', kid: `rw-${Date.now().toString(36)}` };

  const configuration: Configuration = {
    clients: [
      {
        client_id: config.OIDC_CLIENT_ID,
        client_name: 'Ratewarden',
        client_secret: config.OIDC_CLIENT_SECRET,
        redirect_uris: [config.OIDC_REDIRECT_URI, ...config.IDP_EXTRA_REDIRECT_URIS],
        post_logout_redirect_uris: [config.APP_BASE_URL, ...config.IDP_EXTRA_REDIRECT_URIS.map((u) => new URL('/', u).href)],
        grant_types: ['authorization_code'],
        response_types: ['code'],
        token_endpoint_auth_method: 'client_secret_post',
      },
      {
        client_id: config.HR_CLIENT_ID,
        client_name: 'HR roster sync (demo)',
        client_secret: config.HR_CLIENT_SECRET,
        grant_types: ['client_credentials'],
        redirect_uris: [],
        response_types: [],
        token_endpoint_auth_method: 'client_secret_basic',
        scope: 'intake:write',
      },
    ],
    async findAccount(_ctx, sub) {
      const account = demoAccounts.find((a) => a.sub === sub);
      if (!account) return undefined;
      return {
        accountId: sub,
        claims: async () => ({ sub, email: account.email, email_verified: true, name: account.name }),
      };
    },
    claims: { openid: ['sub'], email: ['email', 'email_verified'], profile: ['name'] },
    scopes: ['openid', 'email', 'profile', 'intake:write'],
    jwks: { keys: [signingKey] },
    cookies: { keys: [config.OIDC_CLIENT_SECRET] },
    // passport-openidconnect has no PKCE; state and nonce protect the code flow instead.
    pkce: { required: () => false },
    interactions: { url: (_ctx, interaction) => `/interaction/${interaction.uid}` },
    features: {
      devInteractions: { enabled: false },
      clientCredentials: { enabled: true },
      rpInitiatedLogout: {
        enabled: true,
        logoutSource: async (ctx, form) => {
          ctx.body = signOutPage(form);
        },
        postLogoutSuccessSource: async (ctx) => {
          ctx.body = signedOutPage();
        },
      },
      resourceIndicators: {
        enabled: true,
        // Only machine clients get API tokens; people's tokens stay for the userinfo endpoint.
        defaultResource: (_ctx, client) => (client?.grantTypes?.includes('client_credentials') ? config.API_AUDIENCE : undefined) as string,
        getResourceServerInfo: () => ({
          scope: 'intake:write',
          audience: config.API_AUDIENCE,
          accessTokenTTL: config.ACCESS_TOKEN_TTL_SECONDS,
          accessTokenFormat: 'jwt',
          jwt: { sign: { alg: 'RS256' } },
        }),
        useGrantedResource: () => false,
      },
    },
    ttl: { Session: 8 * 3600, Interaction: 600, Grant: 8 * 3600, AccessToken: 600, IdToken: 3600, AuthorizationCode: 60 },
    renderError: async (ctx, out) => {
      ctx.type = 'html';
      ctx.body = `<!doctype html><title>Sign-in error</title><p>${String(out.error_description ?? out.error).replace(/[<>&]/g, '')}</p>`;
    },
  };
  const provider = new Provider(config.issuer, configuration);
  provider.proxy = true;
  return provider;
}
