/**
 * Local OpenID Connect identity provider for development and tests (oidc-provider), on 127.0.0.1.
 * It knows the demo organization's company accounts and nothing else, and it is never used in
 * production: production points at the company's issuer through the organization's settings.
 * Plain ESM JavaScript because oidc-provider is ESM-only; started by the start and test scripts.
 */
import { createServer } from 'node:http';
import Provider from 'oidc-provider';

const port = Number(process.env.OIDC_DEV_PORT ?? 4010);
const issuer = `http://127.0.0.1:${port}`;
const clientId = process.env.OIDC_DEV_CLIENT_ID ?? 'lagwise-local';
const clientSecret = process.env.OIDC_DEV_CLIENT_SECRET ?? 'local-development-client-secret';
const appPorts = (process.env.OIDC_DEV_APP_PORTS ?? '3000,3100').split(',');

// Company accounts of the demo scenario (invented). Passwords are for this local provider only.
const ACCOUNTS = {
  'owner@korvane.example': { name: 'Olwen Ayres', password: 'korvane-sso-owner' },
  'engineer@korvane.example': { name: 'Dario Fenn', password: 'korvane-sso-engineer' },
  'reviewer@korvane.example': { name: 'Mira Castell', password: 'korvane-sso-reviewer' },
  'newcomer@korvane.example': { name: 'Nadia Okafor', password: 'korvane-sso-newcomer' },
  'approved@korvane.example': { name: 'Arun Pillai', password: 'korvane-sso-approved' },
  'outsider@elsewhere.example': { name: 'Olaf Outsider', password: 'elsewhere-sso-outsider' },
};

const provider = new Provider(issuer, {
  clients: [{
    client_id: clientId,
    client_secret: clientSecret,
    redirect_uris: appPorts.flatMap((p) => [`http://127.0.0.1:${p}/auth/company/callback`, `http://localhost:${p}/auth/company/callback`]),
    response_types: ['code'],
    grant_types: ['authorization_code'],
    token_endpoint_auth_method: 'client_secret_post',
  }],
  async findAccount(_ctx, id) {
    const a = ACCOUNTS[id];
    if (!a) return undefined;
    return { accountId: id, async claims() { return { sub: id, email: id, email_verified: true, name: a.name }; } };
  },
  claims: { openid: ['sub'], email: ['email', 'email_verified'], profile: ['name'] },
  scopes: ['openid', 'email', 'profile'],
  pkce: { required: () => true },
  features: { devInteractions: { enabled: false } },
  interactions: { url: (_ctx, interaction) => `/interaction/${interaction.uid}` },
  cookies: { keys: ['local-development-cookie-key'] },
  ttl: { AccessToken: 600, AuthorizationCode: 60, IdToken: 600, Interaction: 600, Session: 3600, Grant: 3600 },
});
provider.on('server_error', (_ctx, err) => console.error('[idp] server error', err.message));

const page = (body) => `<!doctype html><html><head><meta charset="utf-8"><title>Korvane company sign-in (local)</title>
<style>body{font-family:system-ui,sans-serif;max-width:360px;margin:60px auto;color:#23282e}input{display:block;width:100%;padding:6px;margin:4px 0 12px}button{padding:8px 14px}</style></head><body>${body}</body></html>`;
const esc = (s) => String(s).replace(/[&<>"]/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;' })[c]);

async function readForm(req) {
  let data = '';
  for await (const chunk of req) data += chunk;
  return Object.fromEntries(new URLSearchParams(data));
}

const handler = provider.callback();
createServer(async (req, res) => {
  try {
    const m = req.url.match(/^\/interaction\/([^/?]+)(\/login)?/);
    if (!m) return handler(req, res);
    const details = await provider.interactionDetails(req, res);
    if (req.method === 'POST' && m[2]) {
      const form = await readForm(req);
      const account = ACCOUNTS[String(form.email ?? '').toLowerCase()];
      if (!account || account.password !== form.password) {
        res.setHeader('content-type', 'text/html');
        res.end(page(`<h1>Korvane sign-in</h1><p role="alert">E-mail or password is not right.</p>${loginForm(details.uid, form.email)}`));
        return;
      }
      await provider.interactionFinished(req, res, { login: { accountId: String(form.email).toLowerCase() } }, { mergeWithLastSubmission: false });
      return;
    }
    if (details.prompt.name === 'login') {
      res.setHeader('content-type', 'text/html');
      res.end(page(`<h1>Korvane sign-in</h1><p>Local development identity provider.</p>${loginForm(details.uid, '')}`));
      return;
    }
    // Consent: the company has pre-approved Lagwise for its people.
    const grant = details.grantId ? await provider.Grant.find(details.grantId) : new provider.Grant({ accountId: details.session.accountId, clientId: details.params.client_id });
    grant.addOIDCScope('openid email profile');
    const grantId = await grant.save();
    await provider.interactionFinished(req, res, { consent: { grantId } }, { mergeWithLastSubmission: true });
  } catch (e) {
    res.statusCode = 400;
    res.end(page(`<p>Sign-in failed: ${esc(e.message)}</p>`));
  }
}).listen(port, '127.0.0.1', () => console.error(`[idp] local identity provider at ${issuer}`));

function loginForm(uid, email) {
  return `<form method="post" action="/interaction/${esc(uid)}/login"><label for="e">Company e-mail</label><input id="e" name="email" type="email" value="${esc(email ?? '')}" autofocus>
<label for="p">Company password</label><input id="p" name="password" type="password"><button type="submit">Sign in to Korvane</button></form>`;
}
