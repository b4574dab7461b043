/**
 * Local OpenID Connect identity provider for development and tests (oidc-provider), on 127.0.0.1.
 * It knows the demo organization's company accounts and nothing else, and it is never used in
 * production: production points at the company's issuer through the organization's settings.
 * Plain ESM JavaScript because oidc-provider is ESM-only; started by the start and test scripts.
 *
 * For tests it has a small control surface on its own loopback port (never part of the app):
 * - POST /dev/accounts {login, password, sub, email, email_verified (true | false | null = claim left out),
 *   name, extraAudience, azp} adds a company account — a second subject with an e-mail another account
 *   already has, an unverified e-mail, an ID token with an extra audience (and azp as given, or none);
 * - POST /dev/hostile/<name> {mode: 'json' | 'huge' | 'slow' | 'redirect', document, location} makes
 *   /hostile/<name>/.well-known/openid-configuration answer like a hostile provider would.
 * Its signing key is made at start (jose) so the ID token can be re-signed with the extra audience.
 */
import { createServer } from 'node:http';
import Provider from 'oidc-provider';
import { SignJWT, decodeJwt, exportJWK, generateKeyPair, importJWK } from 'jose';

const port = Number(process.env.OIDC_DEV_PORT ?? 4010);
const issuer = `http://127.0.0.1:${port}`;
const clientId = process.env.OIDC_DEV_CLIENT_ID ?? 'lagwise-local';
const clientSecret = process.env.OIDC_DEV_CLIENT_SECRET ?? 'local-development-client-secret';
const appPorts = (process.env.OIDC_DEV_APP_PORTS ?? '3000,3100').split(',');

// Company accounts of the demo scenario (invented), by login. Passwords are for this local provider only.
const ACCOUNTS = new Map(
  Object.entries({
    'owner@korvane.example': { name: 'Olwen Ayres', password: 'korvane-sso-owner' },
    'engineer@korvane.example': { name: 'Dario Fenn', password: 'korvane-sso-engineer' },
    'reviewer@korvane.example': { name: 'Mira Castell', password: 'korvane-sso-reviewer' },
    'newcomer@korvane.example': { name: 'Nadia Okafor', password: 'korvane-sso-newcomer' },
    'approved@korvane.example': { name: 'Arun Pillai', password: 'korvane-sso-approved' },
    'outsider@elsewhere.example': { name: 'Olaf Outsider', password: 'elsewhere-sso-outsider' },
  }).map(([login, a]) => [login, { ...a, sub: login, email: login, email_verified: true }]),
);
const bySub = (sub) => [...ACCOUNTS.values()].find((a) => a.sub === sub);
const HOSTILE = new Map();

const { privateKey } = await generateKeyPair('RS256', { extractable: true });
const signingJwk = { ...(await exportJWK(privateKey)), kid: 'dev-idp-1', alg: 'RS256', use: 'sig' };
const signingKey = await importJWK(signingJwk, 'RS256');

const provider = new Provider(issuer, {
  clients: [
    {
      client_id: clientId,
      client_secret: clientSecret,
      redirect_uris: appPorts.flatMap((p) => [
        `http://127.0.0.1:${p}/auth/company/callback`,
        `http://localhost:${p}/auth/company/callback`,
      ]),
      response_types: ['code'],
      grant_types: ['authorization_code'],
      token_endpoint_auth_method: 'client_secret_post',
    },
  ],
  jwks: { keys: [signingJwk] },
  async findAccount(_ctx, id) {
    const a = bySub(id);
    if (!a) return undefined;
    return {
      accountId: id,
      async claims() {
        return {
          sub: id,
          email: a.email,
          ...(a.email_verified === null ? {} : { email_verified: a.email_verified }),
          name: a.name,
        };
      },
    };
  },
  claims: { openid: ['sub'], email: ['email', 'email_verified'], profile: ['name'] },
  scopes: ['openid', 'email', 'profile'],
  pkce: { required: () => true },
  features: { devInteractions: { enabled: false } },
  interactions: { url: (_ctx, interaction) => `/interaction/${interaction.uid}` },
  cookies: { keys: ['local-development-cookie-key'] },
  ttl: {
    AccessToken: 600,
    AuthorizationCode: 60,
    IdToken: 600,
    Interaction: 600,
    Session: 3600,
    Grant: 3600,
  },
});
provider.on('server_error', (_ctx, err) => console.error('[idp] server error', err.message));

const page = (
  body,
) => `<!doctype html><html><head><meta charset="utf-8"><title>Korvane company sign-in (local)</title>
<style>body{font-family:system-ui,sans-serif;max-width:360px;margin:60px auto;color:#23282e}input{display:block;width:100%;padding:6px;margin:4px 0 12px}button{padding:8px 14px}</style></head><body>${body}</body></html>`;
const esc = (s) =>
  String(s).replace(/[&<>"]/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;' })[c]);

async function readForm(req) {
  let data = '';
  for await (const chunk of req) data += chunk;
  return Object.fromEntries(new URLSearchParams(data));
}

const handler = provider.callback();

async function readJson(req) {
  let data = '';
  for await (const chunk of req) data += chunk;
  return data ? JSON.parse(data) : {};
}

/** Test control and hostile documents; true when the request was answered here. */
async function control(req, res) {
  if (req.method === 'POST' && req.url === '/dev/accounts') {
    const a = await readJson(req);
    const login = String(a.login).toLowerCase();
    ACCOUNTS.set(login, {
      name: a.name ?? login,
      password: a.password,
      sub: a.sub ?? login,
      email: a.email ?? login,
      email_verified: a.email_verified === undefined ? true : a.email_verified,
      extraAudience: a.extraAudience,
      azp: a.azp,
    });
    res.setHeader('content-type', 'application/json');
    res.end(JSON.stringify({ ok: true }));
    return true;
  }
  const h = req.url.match(/^\/dev\/hostile\/([a-z0-9-]+)$/);
  if (req.method === 'POST' && h) {
    HOSTILE.set(h[1], await readJson(req));
    res.end('{"ok":true}');
    return true;
  }
  const d = req.url.match(/^\/hostile\/([a-z0-9-]+)\/\.well-known\/openid-configuration$/);
  if (d && HOSTILE.has(d[1])) {
    const spec = HOSTILE.get(d[1]);
    if (spec.mode === 'slow') return true; // never answers
    if (spec.mode === 'redirect') {
      res.statusCode = 302;
      res.setHeader('location', spec.location);
      res.end();
      return true;
    }
    res.setHeader('content-type', 'application/json');
    if (spec.mode === 'huge') {
      res.end(JSON.stringify({ issuer: `${issuer}/hostile/${d[1]}`, padding: 'x'.repeat(2 * 1024 * 1024) }));
      return true;
    }
    res.end(JSON.stringify(spec.document));
    return true;
  }
  return false;
}

/** Token answers for accounts with an extra audience: the ID token is re-signed with aud [client, extra] and azp as set. */
function rewriteTokenResponse(res) {
  const end = res.end.bind(res),
    setHeader = res.setHeader.bind(res);
  res.setHeader = (k, v) => (String(k).toLowerCase() === 'content-length' ? res : setHeader(k, v));
  res.end = (body, ...rest) => {
    let parsed;
    try {
      parsed = JSON.parse(String(body));
    } catch {
      return end(body, ...rest);
    }
    const claims = parsed?.id_token ? decodeJwt(parsed.id_token) : null;
    const account = claims ? bySub(claims.sub) : null;
    if (!account?.extraAudience) return end(body, ...rest);
    const { aud, azp: _azp, ...others } = claims;
    const payload = {
      ...others,
      aud: [aud, account.extraAudience].flat(),
      ...(account.azp ? { azp: account.azp } : {}),
    };
    new SignJWT(payload)
      .setProtectedHeader({ alg: 'RS256', kid: signingJwk.kid, typ: 'JWT' })
      .sign(signingKey)
      .then(
        (t) => end(JSON.stringify({ ...parsed, id_token: t })),
        (e) => {
          console.error('[idp] re-sign failed', e.message);
          end(body);
        },
      );
    return res;
  };
}

createServer(async (req, res) => {
  try {
    if (await control(req, res)) return;
    if (req.method === 'POST' && req.url.startsWith('/token')) rewriteTokenResponse(res);
    const m = req.url.match(/^\/interaction\/([^/?]+)(\/login)?/);
    if (!m) return handler(req, res);
    const details = await provider.interactionDetails(req, res);
    if (req.method === 'POST' && m[2]) {
      const form = await readForm(req);
      const account = ACCOUNTS.get(String(form.email ?? '').toLowerCase());
      if (!account || account.password !== form.password) {
        res.setHeader('content-type', 'text/html');
        res.end(
          page(
            `<h1>Korvane sign-in</h1><p role="alert">E-mail or password is not right.</p>${loginForm(details.uid, form.email)}`,
          ),
        );
        return;
      }
      await provider.interactionFinished(
        req,
        res,
        { login: { accountId: account.sub } },
        { mergeWithLastSubmission: false },
      );
      return;
    }
    if (details.prompt.name === 'login') {
      res.setHeader('content-type', 'text/html');
      res.end(
        page(
          `<h1>Korvane sign-in</h1><p>Local development identity provider.</p>${loginForm(details.uid, '')}`,
        ),
      );
      return;
    }
    // Consent: the company has pre-approved Lagwise for its people.
    const grant = details.grantId
      ? await provider.Grant.find(details.grantId)
      : new provider.Grant({ accountId: details.session.accountId, clientId: details.params.client_id });
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
