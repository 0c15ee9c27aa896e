// A small cookie-keeping HTTP client that signs in through next-auth like a browser does.
export class Client {
  private cookies = new Map<string, string>();
  constructor(readonly base: string) {}

  private cookieHeader(): string {
    return [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; ');
  }

  private keep(res: Response): void {
    for (const c of res.headers.getSetCookie()) {
      const [pair] = c.split(';');
      const i = pair!.indexOf('=');
      const name = pair!.slice(0, i);
      const value = pair!.slice(i + 1);
      if (/Max-Age=0|Expires=Thu, 01 Jan 1970/i.test(c) || value === '') this.cookies.delete(name);
      else this.cookies.set(name, value);
    }
  }

  async request(method: string, path: string, body?: unknown, headers: Record<string, string> = {}): Promise<Response> {
    const h: Record<string, string> = { cookie: this.cookieHeader(), ...headers };
    let payload: string | undefined;
    if (body !== undefined) {
      payload = typeof body === 'string' ? body : JSON.stringify(body);
      h['content-type'] ??= 'application/json';
    }
    const res = await fetch(this.base + path, { method, headers: h, body: payload, redirect: 'manual' });
    this.keep(res);
    return res;
  }

  get = (p: string) => this.request('GET', p);
  post = (p: string, b?: unknown) => this.request('POST', p, b ?? {});
  patch = (p: string, b?: unknown) => this.request('PATCH', p, b ?? {});
  del = (p: string) => this.request('DELETE', p);

  async json<T = Record<string, unknown>>(method: string, path: string, body?: unknown): Promise<{ status: number; body: T }> {
    const res = await this.request(method, path, body);
    const text = await res.text();
    return { status: res.status, body: (text ? JSON.parse(text) : null) as T };
  }

  /** next-auth credentials sign-in: fetch the CSRF token, post the form, keep the session cookie. */
  async signIn(email: string, password: string): Promise<{ ok: boolean; error: string | null }> {
    const csrf = await this.request('GET', '/api/auth/csrf');
    const { csrfToken } = (await csrf.json()) as { csrfToken: string };
    const form = new URLSearchParams({ csrfToken, email, password, json: 'true', callbackUrl: `${this.base}/app` });
    const res = await this.request('POST', '/api/auth/callback/credentials', form.toString(), { 'content-type': 'application/x-www-form-urlencoded' });
    const location = res.headers.get('location') ?? '';
    // next-auth answers 200 or 401 with { url } when json=true; the url carries ?error= on failure.
    const data = (res.headers.get('content-type') ?? '').includes('json') ? ((await res.json()) as { url?: string }) : null;
    const url = new URL(data?.url ?? (location || this.base), this.base);
    const error = url.searchParams.get('error');
    return { ok: !error && this.cookies.has('next-auth.session-token'), error };
  }

  /** A second client holding a copy of this one's cookies (a stolen or second-tab session). */
  clone(): Client {
    const c = new Client(this.base);
    for (const [k, v] of this.cookies) c.cookies.set(k, v);
    return c;
  }

  /** The Cookie header this client sends (for requests made with fetch directly, e.g. streamed bodies). */
  cookie(): string {
    return this.cookieHeader();
  }

  hasSession(): boolean {
    return this.cookies.has('next-auth.session-token');
  }
}

let counter = 0;
export const uniqueEmail = (tag: string) => `${tag}-${Date.now().toString(36)}-${(counter++).toString(36)}@test-firm.example`;
