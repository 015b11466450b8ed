import { createRemoteJWKSet, errors, jwtVerify } from 'jose';
import type { DataSource } from 'typeorm';
import { IntegrationClientEntity } from '@ratewarden/db';
import type { Principal } from '@ratewarden/shared/permissions';
import type { ApiConfig } from '../config';
import { AppError } from '../lib/app-error';
import { discover } from './discovery';

const keySets = new Map<string, ReturnType<typeof createRemoteJWKSet>>();

/**
 * Verifies an integration client's access token: signature against the issuer's published keys,
 * issuer, audience, expiry and the `intake:write` scope; then that Ratewarden's administrator has
 * registered the client and not revoked it.
 */
export async function verifyClientToken(ds: DataSource, config: ApiConfig, token: string): Promise<Extract<Principal, { kind: 'client' }>> {
  const metadata = await discover(config.OIDC_ISSUER);
  let keys = keySets.get(metadata.jwks_uri);
  if (!keys) {
    keys = createRemoteJWKSet(new URL(metadata.jwks_uri));
    keySets.set(metadata.jwks_uri, keys);
  }
  let payload;
  try {
    ({ payload } = await jwtVerify(token, keys, { issuer: metadata.issuer, audience: config.OIDC_API_AUDIENCE }));
  } catch (err) {
    const why =
      err instanceof errors.JWTExpired
        ? 'it has expired'
        : err instanceof errors.JWTClaimValidationFailed
          ? `its ${err.claim} claim is wrong`
          : 'its signature or format is invalid';
    throw new AppError('unauthenticated', `the access token was refused: ${why}`);
  }
  const clientId = typeof payload.client_id === 'string' ? payload.client_id : undefined;
  const scopes = typeof payload.scope === 'string' ? payload.scope.split(' ') : [];
  if (!clientId) throw new AppError('unauthenticated', 'the access token was refused: it names no client');
  if (!scopes.includes('intake:write')) throw new AppError('forbidden', 'the access token lacks the intake:write scope');
  const client = await ds.getRepository(IntegrationClientEntity).findOne({ select: { clientId: true, revokedAt: true }, where: { clientId } });
  if (!client) throw new AppError('forbidden', `integration client ${clientId} is not registered in Ratewarden`);
  if (client.revokedAt) throw new AppError('forbidden', `integration client ${clientId} has been revoked`);
  return { kind: 'client', clientId };
}
