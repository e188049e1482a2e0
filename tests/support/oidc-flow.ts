/** Drives the identity provider's sign-in pages the way a browser would: cookies, redirects, the form post. */
export class CookieJar {
  private cookies = new Map<string, Map<string, string>>();
  store(url: string, res: Response): void {
    const host = new URL(url).host;
    const jar = this.cookies.get(host) ?? new Map<string, string>();
    for (const line of res.headers.getSetCookie()) {
      const [pair] = line.split(';');
      const eq = pair!.indexOf('=');
      const name = pair!.slice(0, eq).trim();
      const value = pair!.slice(eq + 1).trim();
      if (/expires=Thu, 01 Jan 1970/i.test(line) || /max-age=0/i.test(line) || value === '') jar.delete(name);
      else jar.set(name, value);
    }
    this.cookies.set(host, jar);
  }
  header(url: string): string {
    const jar = this.cookies.get(new URL(url).host);
    return jar ? [...jar].map(([k, v]) => `${k}=${v}`).join('; ') : '';
  }
}

/** Follows redirects on the identity provider until one leaves it; returns that Location. */
export async function followUntilLeaving(jar: CookieJar, start: string, issuer: string, init?: RequestInit): Promise<{ location: string; last: Response }> {
  let url = start;
  let res = await fetch(url, { ...init, redirect: 'manual', headers: { ...init?.headers, cookie: jar.header(url) } });
  jar.store(url, res);
  for (let i = 0; i < 10; i++) {
    const loc = res.headers.get('location');
    if (!loc) return { location: '', last: res };
    const next = new URL(loc, url).href;
    if (!next.startsWith(issuer)) return { location: next, last: res };
    url = next;
    res = await fetch(url, { redirect: 'manual', headers: { cookie: jar.header(url) } });
    jar.store(url, res);
  }
  throw new Error('too many redirects');
}

/** From the IdP authorization URL to the app's callback URL, signing in as email/password. */
export async function signInAtIdp(authUrl: string, issuer: string, email: string, password: string): Promise<{ callbackUrl: string; status: number; body: string }> {
  const jar = new CookieJar();
  const first = await followUntilLeaving(jar, authUrl, issuer);
  // We are now on the interaction page (the last response is the sign-in form).
  const page = first.last;
  const pageUrl = first.location || page.url;
  const html = await page.text();
  const action = /<form[^>]*action="([^"]+)"/.exec(html)?.[1];
  if (!action) return { callbackUrl: '', status: page.status, body: html };
  const postUrl = new URL(action.replace(/&amp;/g, '&'), issuer + '/').href;
  const res = await followUntilLeaving(jar, postUrl, issuer, {
    method: 'POST',
    headers: { 'content-type': 'application/x-www-form-urlencoded' },
    body: new URLSearchParams({ email, password }).toString(),
  });
  void pageUrl;
  return { callbackUrl: res.location, status: res.last.status, body: res.location ? '' : await res.last.text() };
}
