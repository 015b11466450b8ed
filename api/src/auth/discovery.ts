import { z } from 'zod';
import { AppError } from '../lib/app-error';

const metadataSchema = z.object({
  issuer: z.string(),
  authorization_endpoint: z.string().url(),
  token_endpoint: z.string().url(),
  userinfo_endpoint: z.string().url(),
  jwks_uri: z.string().url(),
  end_session_endpoint: z.string().url().optional(),
});
export type IssuerMetadata = z.infer<typeof metadataSchema>;

const cache = new Map<string, Promise<IssuerMetadata>>();

/**
 * The issuer's OpenID Connect discovery document, fetched on first use and kept; a failed fetch
 * is not kept, so sign-in recovers as soon as the identity provider is back.
 */
export function discover(issuer: string): Promise<IssuerMetadata> {
  let pending = cache.get(issuer);
  if (!pending) {
    pending = fetch(new URL('.well-known/openid-configuration', issuer.endsWith('/') ? issuer : `${issuer}/`), {
      signal: AbortSignal.timeout(5_000),
    })
      .then(async (res) => {
        if (!res.ok) throw new Error(`discovery answered ${res.status}`);
        return metadataSchema.parse(await res.json());
      })
      .catch((err: unknown) => {
        cache.delete(issuer);
        throw new AppError('service_unavailable', `the identity provider at ${issuer} cannot be reached (${(err as Error).message})`);
      });
    cache.set(issuer, pending);
  }
  return pending;
}
