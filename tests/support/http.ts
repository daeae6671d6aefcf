// A small HTTP client for tests that keeps one person's cookies, talking to the real server.
import { APP_URL, DEMO_PASSWORD } from './env';

export class Client {
	private cookies = new Map<string, string>();
	constructor(readonly base = APP_URL) {}

	private store(res: Response) {
		for (const line of res.headers.getSetCookie()) {
			const [pair] = line.split(';');
			const eq = pair!.indexOf('=');
			const name = pair!.slice(0, eq).trim();
			const value = pair!.slice(eq + 1).trim();
			if (value === '' || /max-age=0/i.test(line)) this.cookies.delete(name);
			else this.cookies.set(name, value);
		}
	}

	cookieHeader() {
		return [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; ');
	}

	async fetch(path: string, init: RequestInit = {}) {
		const headers = new Headers(init.headers);
		if (this.cookies.size) headers.set('cookie', this.cookieHeader());
		if (!headers.has('origin')) headers.set('origin', this.base);
		const res = await fetch(this.base + path, { ...init, headers, redirect: 'manual' });
		this.store(res);
		return res;
	}

	json(path: string, body?: unknown, method = body === undefined ? 'GET' : 'POST') {
		return this.fetch(path, {
			method,
			headers: body === undefined ? {} : { 'content-type': 'application/json' },
			body: body === undefined ? undefined : JSON.stringify(body)
		});
	}

	/** Signs in through the sign-in page, as a person does (better-auth's JSON routes are closed). */
	async signIn(email: string, password = DEMO_PASSWORD) {
		const res = await this.form('/sign-in', { email, password });
		if (res.status !== 303) throw new Error(`sign-in of ${email} failed: ${res.status} ${await res.text()}`);
		return this;
	}

	/** Makes an artist account through the sign-up page and stays signed in as it. */
	async signUp(name: string, email: string, password: string) {
		const res = await this.form('/sign-up', { name, email, password });
		if (res.status !== 303) throw new Error(`sign-up of ${email} failed: ${res.status} ${await res.text()}`);
		return this;
	}

	/** Posts a SvelteKit form action the way a browser without JavaScript would (pairs repeat a name, as checkboxes do). */
	form(path: string, fields: Record<string, string> | [string, string][]) {
		return this.fetch(path, {
			method: 'POST',
			// A browser's plain form post: SvelteKit answers JSON to anything that does not ask for HTML.
			headers: { 'content-type': 'application/x-www-form-urlencoded', accept: 'text/html' },
			body: new URLSearchParams(fields).toString()
		});
	}
}

export async function signedIn(email: string) {
	return new Client().signIn(email);
}
