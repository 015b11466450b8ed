import { createRequire } from 'node:module';
import express, { type Express } from 'express';
import type Provider from 'oidc-provider';
import type { IdpConfig } from './config';
import { checkCredentials } from './demo-accounts';
import { signInPage } from './pages';
import { signInAttemptLimits } from './sign-in-limits';

/** The stand-in's web app: its own sign-in and consent pages in front of the provider; `main.ts` listens. */
export function createIdentityProviderApp(config: IdpConfig, provider: Provider): Express {
  const app = express();
  app.disable('x-powered-by');

  const fontFile = createRequire(import.meta.url).resolve('@fontsource/noto-sans/files/noto-sans-latin-400-normal.woff2');
  app.get('/fonts/noto-sans.woff2', (_req, res) => res.sendFile(fontFile, { maxAge: '1d' }));

  app.get('/interaction/:uid', async (req, res, next) => {
    try {
      const details = await provider.interactionDetails(req, res);
      if (details.prompt.name === 'login') {
        const client = await provider.Client.find(String(details.params.client_id));
        res.type('html').send(signInPage(details.uid, client?.clientName ?? 'Ratewarden'));
        return;
      }
      // Consent: Ratewarden is the organisation's own application, so the grant is given at once.
      const grant = details.grantId
        ? await provider.Grant.find(details.grantId)
        : new provider.Grant({ accountId: details.session!.accountId, clientId: String(details.params.client_id) });
      const missing = details.prompt.details as { missingOIDCScope?: string[]; missingOIDCClaims?: string[] };
      if (missing.missingOIDCScope) grant!.addOIDCScope(missing.missingOIDCScope.join(' '));
      if (missing.missingOIDCClaims) grant!.addOIDCClaims(missing.missingOIDCClaims);
      const grantId = await grant!.save();
      await provider.interactionFinished(req, res, { consent: { grantId } }, { mergeWithLastSubmission: true });
    } catch (err) {
      next(err);
    }
  });

  app.post('/interaction/:uid/login', express.urlencoded({ extended: false, limit: '4kb' }), ...signInAttemptLimits(config), async (req, res, next) => {
    try {
      const details = await provider.interactionDetails(req, res);
      const email = String(req.body?.email ?? '');
      const account = checkCredentials(email, String(req.body?.password ?? ''));
      if (!account) {
        const client = await provider.Client.find(String(details.params.client_id));
        res
          .status(401)
          .type('html')
          .send(signInPage(details.uid, client?.clientName ?? 'Ratewarden', 'That e-mail and password do not match an account.', email));
        return;
      }
      await provider.interactionFinished(req, res, { login: { accountId: account.sub } }, { mergeWithLastSubmission: false });
    } catch (err) {
      next(err);
    }
  });

  app.use(provider.callback());
  return app;
}
