/**
 * A tiny browser stand-in for integration tests: keeps cookies, sends the Origin header SvelteKit
 * requires on form posts, never follows redirects (tests assert them).
 */
export class TestClient {
	readonly cookies = new Map<string, string>();
	constructor(readonly baseUrl: string) {}

	private cookieHeader(): string {
		return [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; ');
	}

	private keepCookies(res: Response) {
		for (const line of res.headers.getSetCookie()) {
			const [pair, ...attrs] = line.split(';');
			const eq = pair.indexOf('=');
			const name = pair.slice(0, eq).trim();
			const value = pair.slice(eq + 1).trim();
			const expired = attrs.some((a) => /max-age=0\b/i.test(a.trim()) || /expires=thu, 01 jan 1970/i.test(a.trim()));
			if (expired || value === '') this.cookies.delete(name);
			else this.cookies.set(name, value);
		}
	}

	/** GET a page as a browser would (Accept: text/html) unless `accept` says otherwise. */
	async get(path: string, options: { accept?: string } = {}): Promise<Response> {
		const res = await fetch(new URL(path, this.baseUrl), {
			redirect: 'manual',
			headers: { accept: options.accept ?? 'text/html', cookie: this.cookieHeader() }
		});
		this.keepCookies(res);
		return res;
	}

	/** POST a form (urlencoded) with a same-origin Origin header, as a plain HTML form would. */
	async post(path: string, fields: Record<string, string> = {}, options: { accept?: string } = {}): Promise<Response> {
		const res = await fetch(new URL(path, this.baseUrl), {
			method: 'POST',
			redirect: 'manual',
			headers: {
				accept: options.accept ?? 'text/html',
				origin: new URL(this.baseUrl).origin,
				'content-type': 'application/x-www-form-urlencoded',
				cookie: this.cookieHeader()
			},
			body: new URLSearchParams(fields)
		});
		this.keepCookies(res);
		return res;
	}

	/** POST JSON (for `+server.ts` endpoints). */
	async postJson(path: string, body: unknown): Promise<Response> {
		const res = await fetch(new URL(path, this.baseUrl), {
			method: 'POST',
			redirect: 'manual',
			headers: {
				accept: 'application/json',
				origin: new URL(this.baseUrl).origin,
				'content-type': 'application/json',
				cookie: this.cookieHeader()
			},
			body: JSON.stringify(body)
		});
		this.keepCookies(res);
		return res;
	}

	/** Signs in with e-mail and password through the sign-in form; throws unless it worked. */
	async signIn(email: string, password: string): Promise<this> {
		const res = await this.post('/signin?/password', { email, password, redirectTo: '/' });
		if (res.status !== 303 || ![...this.cookies.keys()].some((k) => k.includes('session-token'))) {
			throw new Error(`sign-in of ${email} failed: HTTP ${res.status}`);
		}
		return this;
	}
}

/** A client already signed in. */
export async function signedInClient(baseUrl: string, user: { email: string; password: string }): Promise<TestClient> {
	return new TestClient(baseUrl).signIn(user.email, user.password);
}
