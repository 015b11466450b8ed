import { inject } from 'vitest';
import { readApiConfig, type ApiConfig } from '@ratewarden/api/config';

/** API settings for tests: the test identity provider and the app port it knows. */
export function testApiConfig(overrides: NodeJS.ProcessEnv = {}): ApiConfig {
  const { issuer, appPort } = inject('auth');
  return readApiConfig({
    NODE_ENV: 'test',
    OIDC_ISSUER: issuer,
    OIDC_REDIRECT_URI: `http://127.0.0.1:${appPort}/auth/callback`,
    APP_BASE_URL: `http://127.0.0.1:${appPort}/`,
    AUTH_RATE_LIMIT: '10000',
    INTAKE_RATE_LIMIT: '10000',
    ...overrides,
  });
}
