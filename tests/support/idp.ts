/** Drives the local identity provider over HTTP like a browser: follows redirects, keeps cookies, fills the login form. */
export async function loginAtIdp(authorizationUrl: string, email: string, password: string, stopAt: string): Promise<URL> {
  const jar = new Map<string, string>();
  const cookieHeader = () => [...jar].map(([k, v]) => `${k}=${v}`).join('; ');
  const keep = (r: Response) => { for (const c of r.headers.getSetCookie()) { const [kv] = c.split(';'); const i = kv.indexOf('='); jar.set(kv.slice(0, i), kv.slice(i + 1)); } };
  let url = new URL(authorizationUrl);
  let method = 'GET';
  let body: string | undefined;
  for (let step = 0; step < 20; step++) {
    if (url.toString().startsWith(stopAt)) return url;
    const r = await fetch(url, { method, body, redirect: 'manual', headers: { cookie: cookieHeader(), ...(body ? { 'content-type': 'application/x-www-form-urlencoded' } : {}) } });
    keep(r);
    method = 'GET'; body = undefined;
    const loc = r.headers.get('location');
    if (loc) { url = new URL(loc, url); continue; }
    const html = await r.text();
    const action = html.match(/<form method="post" action="([^"]+)"/);
    if (r.status === 200 && action && !html.includes('role="alert"')) {
      url = new URL(action[1], url); method = 'POST';
      body = new URLSearchParams({ email, password }).toString();
      continue;
    }
    throw new Error(`identity provider stopped at ${url} (${r.status}): ${html.slice(0, 200)}`);
  }
  throw new Error('too many redirects at the identity provider');
}
