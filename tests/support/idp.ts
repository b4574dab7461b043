/** Drives the local identity provider over HTTP like a browser: follows redirects, keeps cookies, fills the login form. */
export async function loginAtIdp(
  authorizationUrl: string,
  email: string,
  password: string,
  stopAt: string,
): Promise<URL> {
  const jar = new Map<string, string>();
  const cookieHeader = () => [...jar].map(([k, v]) => `${k}=${v}`).join('; ');
  const keep = (r: Response) => {
    for (const c of r.headers.getSetCookie()) {
      const [kv] = c.split(';');
      const i = kv.indexOf('=');
      jar.set(kv.slice(0, i), kv.slice(i + 1));
    }
  };
  let url = new URL(authorizationUrl);
  let method = 'GET';
  let body: string | undefined;
  for (let step = 0; step < 20; step++) {
    if (url.toString().startsWith(stopAt)) return url;
    const r = await fetch(url, {
      method,
      body,
      redirect: 'manual',
      headers: {
        cookie: cookieHeader(),
        ...(body ? { 'content-type': 'application/x-www-form-urlencoded' } : {}),
      },
    });
    keep(r);
    method = 'GET';
    body = undefined;
    const loc = r.headers.get('location');
    if (loc) {
      url = new URL(loc, url);
      continue;
    }
    const html = await r.text();
    const action = html.match(/<form method="post" action="([^"]+)"/);
    if (r.status === 200 && action && !html.includes('role="alert"')) {
      url = new URL(action[1], url);
      method = 'POST';
      body = new URLSearchParams({ email, password }).toString();
      continue;
    }
    throw new Error(`identity provider stopped at ${url} (${r.status}): ${html.slice(0, 200)}`);
  }
  throw new Error('too many redirects at the identity provider');
}

const idpBase = () => process.env.OIDC_DEV_ISSUER ?? 'http://127.0.0.1:4020';

/**
 * Adds a company account to the local identity provider (its test control surface): another subject
 * with an address someone already has, an unverified (false) or unstated (null) e-mail, an ID token
 * with an extra audience and the azp given.
 */
export async function addIdpAccount(a: {
  login: string;
  password: string;
  sub: string;
  email: string;
  email_verified?: boolean | null;
  name?: string;
  extraAudience?: string;
  azp?: string;
}) {
  const r = await fetch(`${idpBase()}/dev/accounts`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify(a),
  });
  if (!r.ok) throw new Error(`identity provider refused the account (${r.status})`);
}

/** Makes /hostile/<name>/.well-known/openid-configuration of the local provider answer as told. */
export async function hostileDiscovery(
  name: string,
  spec: { mode: 'json' | 'huge' | 'slow' | 'redirect'; document?: object; location?: string },
) {
  const r = await fetch(`${idpBase()}/dev/hostile/${name}`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify(spec),
  });
  if (!r.ok) throw new Error(`identity provider refused the hostile document (${r.status})`);
  return `${idpBase()}/hostile/${name}`;
}

/** Proves a claimed domain the way an owner does: the link mailed to admin@ of the domain, confirmed. */
export async function proveDomain(organizationId: string, domain: string) {
  const { requestDomainProof, confirmDomainProof } = await import('@/lib/auth/sso');
  const { waitForMail, linkIn } = await import('./mail');
  const asked = new Date(Date.now() - 1000);
  const [owner] = await (await import('@/db/client')).db
    .execute<{ user_id: string }>(
      (await import('drizzle-orm'))
        .sql`select user_id from memberships where organization_id = ${organizationId} and role = 'owner' limit 1`,
    )
    .then((r) => r.rows);
  await requestDomainProof({ organizationId, domain, mailbox: 'admin', actorId: owner.user_id });
  const mail = await waitForMail(`admin@${domain}`, { subject: /Confirm that .* may use/, after: asked });
  return confirmDomainProof(linkIn(mail.text, '/verify-domain'));
}
