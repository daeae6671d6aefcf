// Every API endpoint and form action, found from the route tree at run time (a new route is fuzzed
// without anyone listing it), is sent hostile bodies and parameters as each role and as a visitor:
// wrong types, huge, negative and fractional numbers, NUL and other control characters, dates at
// the edges of the calendar and dates that do not exist, times without an offset, arrays for
// objects, 1 MB strings and prototype keys. No answer may be a 5xx, and nothing may be written.
//
// Random choices come from one seed, printed with the run; FUZZ_SEED=<n> repeats a run exactly.
// The fuzz never uses an id that exists (its ids are made up or malformed), sends no value that
// any form could take for a real one, and keeps its sign-in and sign-up posts few, so it disturbs
// neither other spec files nor the sign-in limits they share.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { createHmac } from 'node:crypto';
import { request as httpRequest } from 'node:http';
import { readdirSync, readFileSync } from 'node:fs';
import { join, relative, sep } from 'node:path';
import { sql } from 'drizzle-orm';
import { Client, signedIn } from '../support/http';
import { APP_URL, DEMO } from '../support/env';
import { DEMO_STUDIO_SLUG, testDb } from '../support/db';

const { db, client } = testDb();
afterAll(() => client.end());

const ROUTES = join(process.cwd(), 'src', 'routes');
const SEED = Number(process.env.FUZZ_SEED ?? Math.floor(Math.random() * 2 ** 31));
/** Requests per route, method and role drawn at random, besides the fixed hostile ones. */
const RANDOM_PER_TARGET = Number(process.env.FUZZ_RUNS ?? 4);
const CONCURRENCY = 6;
const MB = 1024 * 1024;

// ---------------------------------------------------------------------------------------------
// The route tree

interface Target {
	/** The route id as SvelteKit writes it, e.g. /api/bookings/[id=uuid]/cancel. */
	route: string;
	method: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
	/** A form action's name (`default` for the page's only action). */
	action?: string;
	/** Field and parameter names read in the route's own files. */
	names: string[];
}

function walk(dir: string): string[] {
	return readdirSync(dir, { withFileTypes: true }).flatMap((e) =>
		e.isDirectory() ? walk(join(dir, e.name)) : [join(dir, e.name)]
	);
}

/** Names a route reads: query parameters, form fields, object keys of its schemas and body fields. */
function namesIn(source: string): string[] {
	const found = new Set<string>();
	const patterns = [
		/searchParams\.(?:get|getAll|has)\('([\w-]+)'\)/g,
		/form\.get\(`?'?([\w-]+)/g,
		/\b(\w+)\s*:\s*(?:z\.|lineText|multilineText|moneyText|percentText|dateText|optionalNumber)/g,
		/\bbody\.(\w+)/g
	];
	for (const re of patterns) for (const m of source.matchAll(re)) found.add(m[1]!);
	return [...found];
}

function discoverTargets(): Target[] {
	const files = walk(ROUTES);
	const targets: Target[] = [];
	for (const file of files) {
		const dir = file.slice(0, file.lastIndexOf(sep));
		const base = file.slice(dir.length + 1);
		const route =
			'/' +
			relative(ROUTES, dir)
				.split(sep)
				.filter((s) => s && !/^\(.*\)$/.test(s))
				.join('/');
		const siblings = files.filter((f) => f.startsWith(dir + sep) && !f.slice(dir.length + 1).includes(sep) && f.endsWith('.ts'));
		const names = [...new Set(siblings.flatMap((f) => namesIn(readFileSync(f, 'utf8'))))];
		if (base === '+server.ts') {
			const source = readFileSync(file, 'utf8');
			for (const m of source.matchAll(/export\s+(?:const|async\s+function|function)\s+(GET|POST|PUT|PATCH|DELETE)\b/g)) {
				targets.push({ route, method: m[1] as Target['method'], names });
			}
		} else if (base === '+page.svelte') {
			targets.push({ route, method: 'GET', names });
		} else if (base === '+page.server.ts') {
			const source = readFileSync(file, 'utf8');
			const at = source.search(/export\s+const\s+actions\b/);
			if (at < 0) continue;
			const block = source.slice(at);
			const actions = new Set<string>();
			for (const m of block.matchAll(/^\t(?:async\s+)?(\w+)\s*(?::\s*async\b|\()/gm)) actions.add(m[1]!);
			for (const action of actions) targets.push({ route, method: 'POST', action, names });
		}
	}
	return targets;
}

// ---------------------------------------------------------------------------------------------
// Hostile values

const EDGE_DATES = [
	'0001-01-01',
	'9999-12-31',
	'0000-00-00',
	'2027-02-30',
	'2026-02-29',
	'2027-13-01',
	'2027-04-31',
	'1899-12-31',
	'2101-01-01',
	'+275760-09-13',
	'-000001-01-01',
	'2027-1-1',
	'20270301'
];
const EDGE_TIMES = [
	'2027-03-28T10:00',
	'2027-03-28T10:00:00',
	'2027-03-28 10:00',
	'2027-03-28T25:00:00+02:00',
	'2027-03-28T10:00:00+99:00',
	'0001-01-01T00:00:00Z',
	'9999-12-31T23:59:59Z',
	'9999-12-31T23:59:59+14:00',
	'0001-01-01T00:00:00-12:00',
	'2027-02-30T10:00:00+02:00',
	'10:00',
	'24:01',
	'-01:00',
	'T'
];
/** Numbers written as text that no amount, percent, count or date field could take for a real value. */
const NUMBER_TEXTS = [
	'-1',
	'-0.01',
	'1e308',
	'-1e308',
	'0.125',
	'3.14159',
	'NaN',
	'Infinity',
	'-Infinity',
	'0x1F',
	'1_000',
	' 12 '
];
const PROTOTYPE_TEXTS = ['__proto__', 'constructor', 'prototype', 'toString', 'hasOwnProperty', '[object Object]'];
const ODD_TEXTS = [
	'',
	' ',
	'\u0000',
	'a\u0000b',
	'\u0000'.repeat(64),
	'\u0007\u0008\u001b[31m',
	'line\r\nbreak',
	'\u007f',
	'\u202eevil',
	'\ud800',
	'\uffff',
	'%00',
	'%',
	'../../etc/passwd',
	"'; drop table booking; --",
	'<script>alert(1)</script>',
	'null',
	'undefined',
	'true',
	'[]',
	'{}'
];

const controlString = fc
	.array(fc.integer({ min: 0, max: 0x1f }), { minLength: 1, maxLength: 8 })
	.chain((codes) =>
		fc.tuple(fc.string({ maxLength: 6 }), fc.constant(String.fromCharCode(...codes)), fc.string({ maxLength: 6 }))
	)
	.map(([a, b, c]) => a + b + c);

/** Any hostile text. `long` is the length of the longest one (a 1 MB body, a 4 kB query). */
function hostileText(long: number) {
	return fc.oneof(
		{ arbitrary: fc.constantFrom(...ODD_TEXTS), weight: 4 },
		{ arbitrary: controlString, weight: 4 },
		{ arbitrary: fc.constantFrom(...EDGE_DATES), weight: 3 },
		{ arbitrary: fc.constantFrom(...EDGE_TIMES), weight: 3 },
		{ arbitrary: fc.constantFrom(...NUMBER_TEXTS), weight: 2 },
		{ arbitrary: fc.constantFrom(...PROTOTYPE_TEXTS), weight: 1 },
		{ arbitrary: fc.constantFrom('x'.repeat(long), '\u0000'.repeat(Math.min(long, 4096))), weight: 1 },
		{ arbitrary: fc.string({ unit: 'binary', maxLength: 40 }), weight: 2 }
	);
}

const hostileNumber = fc.oneof(
	fc.constantFrom(
		1e308,
		-1e308,
		Number.MAX_SAFE_INTEGER + 2,
		-Number.MAX_SAFE_INTEGER,
		-1,
		-0.5,
		0.5,
		3.14159,
		2 ** 31,
		-(2 ** 31)
	),
	fc.double({ noNaN: true, noDefaultInfinity: true }),
	fc.integer()
);

/** A JSON value: hostile scalars, arrays where objects belong and objects where scalars do. */
const hostileJson: fc.Arbitrary<unknown> = fc.letrec((tie) => ({
	value: fc.oneof(
		{ depthSize: 'small', withCrossShrink: true },
		{ arbitrary: hostileText(64 * 1024), weight: 6 },
		{ arbitrary: hostileNumber, weight: 3 },
		{ arbitrary: fc.constantFrom(true, false, null), weight: 1 },
		{ arbitrary: fc.array(tie('value'), { maxLength: 4 }), weight: 1 },
		{
			arbitrary: fc.dictionary(fc.constantFrom(...PROTOTYPE_TEXTS, 'data', 'object', 'id'), tie('value'), { maxKeys: 3 }),
			weight: 1
		}
	)
})).value;

interface Sent {
	method: Target['method'];
	path: string;
	headers: Record<string, string>;
	body?: string | FormData;
	/** How the failure message shows the body. */
	shown: string;
}

function show(value: unknown): string {
	const text = typeof value === 'string' ? value : JSON.stringify(value);
	const cut = text.length > 160 ? `${text.slice(0, 160)}… (${text.length} chars)` : text;
	return JSON.stringify(cut);
}

/** A body of field names from the route and hostile values, as JSON text. */
function jsonBodyText(names: string[], values: unknown[], protoKeys: boolean): string {
	const parts = names.map((n, i) => `${JSON.stringify(n)}:${JSON.stringify(values[i % values.length] ?? null)}`);
	// JSON.stringify never writes an own __proto__ key; a body can have one, so write it by hand.
	if (protoKeys) parts.push('"__proto__":{"role":"owner","isAdmin":true}', '"constructor":{"prototype":{"polluted":true}}');
	return `{${parts.join(',')}}`;
}

function fillPath(route: string, params: string[]): string {
	let i = 0;
	// A studio's short name is the demo studio's, so the hostile values reach its pages and API.
	return route.replaceAll('[studio=studio]', DEMO_STUDIO_SLUG).replace(/\[(?:\.\.\.)?[^\]]+\]/g, () => params[i++] ?? 'x');
}

const paramValue = fc.oneof(
	{ arbitrary: fc.uuid(), weight: 6 },
	{
		arbitrary: fc.constantFrom(
			'not-a-uuid',
			'%00',
			'00000000-0000-0000-0000-00000000000g',
			'-1',
			'1.5',
			'__proto__',
			'%E0%A4%A',
			'..%2F..%2Fapi%2Fhealth',
			'x'.repeat(300)
		),
		weight: 4
	}
);

/** The requests for one target and role: a fixed hostile set, then RANDOM_PER_TARGET random ones. */
function requestsFor(target: Target, seed: number, heavy: boolean): Sent[] {
	const names = [...new Set([...target.names, 'id', 'date', 'room', 'start', 'end', 'notes'])];
	const nameArb = fc.oneof(
		{ arbitrary: fc.constantFrom(...names), weight: 5 },
		{ arbitrary: fc.constantFrom(...PROTOTYPE_TEXTS), weight: 1 }
	);
	const paramCount = (target.route.match(/\[/g) ?? []).length;
	const actionQuery = target.action ? (target.action === 'default' ? '' : `?/${target.action}`) : '';
	const out: Sent[] = [];
	const [params] = fc.sample(fc.array(paramValue, { minLength: paramCount, maxLength: paramCount }), { seed, numRuns: 1 });
	const path = fillPath(target.route, params!);

	if (target.method === 'GET' || target.method === 'DELETE') {
		// Query parameters: every name the route reads, each with one hostile value.
		const queries = fc.sample(
			fc.tuple(
				fc.array(paramValue, { minLength: paramCount, maxLength: paramCount }),
				fc.array(fc.tuple(nameArb, hostileText(4096)), { minLength: 1, maxLength: 6 })
			),
			{ seed: seed + 1, numRuns: RANDOM_PER_TARGET }
		);
		const fixed: [string, string][][] = [
			names.map((n) => [n, 'a\u0000b']),
			names.map((n) => [n, '0001-01-01']),
			names.map((n) => [n, '9999-12-31'])
		];
		for (const pairs of fixed) {
			const q = new URLSearchParams(pairs).toString();
			out.push({ method: target.method, path: `${path}?${q}`, headers: {}, shown: show(q) });
		}
		for (const [p, pairs] of queries) {
			const q = new URLSearchParams(pairs).toString();
			out.push({ method: target.method, path: `${fillPath(target.route, p)}?${q}`, headers: {}, shown: show(q) });
		}
		return out;
	}

	const to = path + actionQuery;
	// A page's form posted without JavaScript gets the whole page back; with it (accept JSON), only
	// the action's result. The NUL and 1 MB posts are the first kind, the others the second.
	const form = (pairs: [string, string][], accept = 'text/html') => ({
		method: target.method,
		path: to,
		headers: { 'content-type': 'application/x-www-form-urlencoded', accept },
		body: new URLSearchParams(pairs).toString(),
		shown: show(new URLSearchParams(pairs).toString())
	});
	const json = (text: string) => ({
		method: target.method,
		path: to,
		headers: { 'content-type': 'application/json', accept: 'application/json' },
		body: text,
		shown: show(text)
	});
	// Fixed: NUL and edge dates in every field, a 1 MB field, a multipart type over a body that is not.
	out.push(form(names.map((n) => [n, 'a\u0000b'])));
	out.push(
		form(
			names.map((n) => [n, '0001-01-01']),
			'application/json'
		)
	);
	out.push(
		form(
			names.map((n) => [n, '9999-12-31']),
			'application/json'
		)
	);
	out.push(json(jsonBodyText(names, ['a\u0000b'], true)));
	out.push(json(jsonBodyText(names, ['9999-12-31T23:59:59+14:00', '0001-01-01'], false)));
	if (heavy) {
		out.push(form([[names[0]!, 'x'.repeat(MB)]]));
		out.push(json(JSON.stringify({ [names[0]!]: 'x'.repeat(MB) })));
	}
	out.push({
		method: target.method,
		path: to,
		headers: { 'content-type': 'multipart/form-data; boundary=fuzz', accept: 'application/json' },
		body: 'this is not multipart',
		shown: '"multipart/form-data over a plain body"'
	});
	out.push(json('{"unterminated": '));
	out.push(json('[1,2,3]'));

	const random = fc.sample(
		fc.tuple(
			fc.constantFrom('form', 'json', 'multipart', 'raw'),
			fc.array(fc.tuple(nameArb, hostileText(64 * 1024)), { minLength: 1, maxLength: 6 }),
			fc.array(hostileJson, { minLength: 1, maxLength: 6 }),
			fc.boolean(),
			hostileJson
		),
		{ seed: seed + 2, numRuns: RANDOM_PER_TARGET }
	);
	for (const [kind, pairs, values, protoKeys, whole] of random) {
		if (kind === 'form') out.push(form(pairs, 'application/json'));
		else if (kind === 'json')
			out.push(
				json(
					jsonBodyText(
						pairs.map(([n]) => n),
						values,
						protoKeys
					)
				)
			);
		else if (kind === 'raw') out.push(json(JSON.stringify(whole) ?? 'null'));
		else {
			const data = new FormData();
			for (const [n, v] of pairs) data.append(n, v);
			data.append('file', new Blob(['\u0000not really a file']), 'fuzz\u0000.txt');
			out.push({ method: target.method, path: to, headers: { accept: 'application/json' }, body: data, shown: show(pairs) });
		}
	}
	return out;
}

// ---------------------------------------------------------------------------------------------
// Who sends them

/**
 * Sends one request on a connection of its own. A server may answer before it has read a body
 * (a redirect to sign-in, a 413) and then close the connection; fetch's shared connections would
 * blame that on whichever request used the connection next.
 */
async function send(cookie: string, s: Sent): Promise<number> {
	const headers: Record<string, string> = { ...s.headers, origin: APP_URL };
	if (cookie) headers.cookie = cookie;
	let body: Buffer | undefined;
	if (s.body instanceof FormData) {
		const encoded = new Request(APP_URL, { method: 'POST', body: s.body });
		body = Buffer.from(await encoded.arrayBuffer());
		headers['content-type'] = encoded.headers.get('content-type')!;
	} else if (s.body !== undefined) body = Buffer.from(s.body);
	if (body) headers['content-length'] = String(body.length);
	return new Promise((resolve, reject) => {
		let answered = false;
		const req = httpRequest(APP_URL + s.path, { method: s.method, headers, agent: false }, (res) => {
			answered = true;
			res.resume();
			res.on('end', () => resolve(res.statusCode ?? 0));
			res.on('error', () => resolve(res.statusCode ?? 0));
			res.on('close', () => resolve(res.statusCode ?? 0));
		});
		req.on('error', (e: NodeJS.ErrnoException) => {
			if (answered) return;
			// A server may answer a large body without reading it (a redirect, a 413) and close the
			// connection (RFC 9112, section 9.6): writing the rest then fails before the answer is read.
			if (body && body.length > 64 * 1024 && (e.code === 'EPIPE' || e.code === 'ECONNRESET')) resolve(0);
			else reject(e);
		});
		req.end(body);
	});
}

type Role = 'visitor' | 'owner' | 'engineer' | 'accountant' | 'artist';

/** Posts that end the session they are sent with: sent by the visitor only. */
const ENDS_SESSION = ['/sign-out', '/api/auth/sign-out'];
/** Posts that count against the sign-in and sign-up limits the other spec files rely on. */
const LIMITED = ['/sign-in', '/sign-up'];
const LIMITED_BUDGET = 4;

/**
 * What the fuzz must leave as it found it: what the owner's forms, bookings, recall sheets and
 * uploads write. (Payments, refunds and Stripe events are left out: the payment jobs and the
 * Stripe fake's late deliveries for earlier files may add to them at any time.)
 */
async function footprint() {
	const [row] = await db.execute<Record<string, string>>(sql`
		select
			(select count(*) from booking)::text as booking,
			(select count(*) from booking_gear)::text as booking_gear,
			(select count(*) from gear_item)::text as gear_item,
			(select md5(string_agg(id::text || active::text || name || hire_fee::text, ',' order by id)) from gear_item) as gear,
			(select count(*) from blackout)::text as blackout,
			(select count(*) from surcharge_rule)::text as surcharge_rule,
			(select md5(string_agg(id::text || name || active::text, ',' order by id)) from room) as room,
			(select md5(string_agg(id, ',' order by id)) from "user") as "user",
			(select md5(string_agg(organization_id || user_id || role, ',' order by organization_id, user_id)) from member) as member,
			(select count(*) from recall_sheet)::text as recall_sheet,
			(select count(*) from upload)::text as upload,
			(select updated_at::text from studio limit 1) as studio
	`);
	return row!;
}

describe('hostile input on every route', () => {
	const targets = discoverTargets();
	const clients = {} as Record<Role, Client>;

	beforeAll(async () => {
		clients.visitor = new Client();
		clients.owner = await signedIn(DEMO.owner);
		clients.engineer = await signedIn(DEMO.engineer);
		clients.accountant = await signedIn(DEMO.accountant);
		clients.artist = await signedIn(DEMO.artist);
	});

	it('finds the API and the form actions in the route tree', () => {
		const has = (method: string, route: string, action?: string) =>
			targets.some((t) => t.method === method && t.route === route && t.action === action);
		expect(has('POST', '/api/studios/[studio=studio]/quote')).toBe(true);
		expect(has('POST', '/api/bookings/[id=uuid]/cancel')).toBe(true);
		expect(has('POST', '/studio/rooms', 'blackout')).toBe(true);
		expect(has('POST', '/[studio=studio]/book', 'default')).toBe(true);
		expect(has('GET', '/api/studios/[studio=studio]/plan')).toBe(true);
		// Route groups such as (studio) add nothing to an address.
		expect(has('GET', '/studio/people')).toBe(true);
		expect(targets.every((t) => !t.route.includes('('))).toBe(true);
		expect(targets.filter((t) => t.action).length).toBeGreaterThanOrEqual(10);
	});

	it('never answers 5xx and writes nothing', async () => {
		const before = await footprint();
		const jobs: { role: Role; sent: Sent }[] = [];
		let limited = 0;
		targets.forEach((target, i) => {
			(['visitor', 'owner', 'engineer', 'accountant', 'artist'] as Role[]).forEach((role, r) => {
				if (target.method !== 'GET' && role !== 'visitor' && ENDS_SESSION.includes(target.route)) return;
				// 1 MB bodies from two of the five: the same routes read them whoever sends them.
				let sent = requestsFor(target, SEED + i * 101 + r * 7, role === 'visitor' || role === 'owner');
				if (target.method !== 'GET' && LIMITED.includes(target.route)) {
					sent = sent.slice(0, Math.max(0, LIMITED_BUDGET - limited));
					limited += sent.length;
				}
				for (const s of sent) jobs.push({ role, sent: s });
			});
		});

		const failures: string[] = [];
		const prof = new Map<string, number>();
		let closedEarly = 0;
		const started = Date.now();
		let next = 0;
		async function worker() {
			while (next < jobs.length) {
				const { role, sent } = jobs[next++]!;
				const what = `${role} ${sent.method} ${sent.path.slice(0, 200)} ${sent.shown}`;
				try {
					const t0 = Date.now();
					const status = await send(clients[role].cookieHeader(), sent);
					const k = `${role} ${sent.method} ${sent.path.split('?')[0]!.replace(/[0-9a-f]{8}-[0-9a-f-]{27}/g, ':id')}`;
					prof.set(k, (prof.get(k) ?? 0) + Date.now() - t0);
					if (status === 0) closedEarly++;
					if (status >= 500) failures.push(`${status} ${what}`);
				} catch (e) {
					// A connection closed without an answer is as much a failure as a 500.
					failures.push(`no answer (${(e as Error).message}) ${what}`);
				}
			}
		}
		await Promise.all(Array.from({ length: CONCURRENCY }, worker));
		const seconds = (Date.now() - started) / 1000;
		console.log(
			`fuzz: ${jobs.length} requests to ${targets.length} routes and actions as 5 roles in ${seconds.toFixed(1)} s, ${closedEarly} large bodies refused unread (seed ${SEED}; FUZZ_SEED=${SEED} repeats it)`
		);

		if (process.env.FUZZ_PROFILE)
			console.log(
				[...prof]
					.sort((a, b) => b[1] - a[1])
					.slice(0, 40)
					.map(([k, v]) => `${v} ${k}`)
					.join('\n')
			);
		expect(failures, `seed ${SEED}: ${failures.length} requests answered 5xx:\n${failures.join('\n')}`).toEqual([]);
		// The sessions the fuzz used are still signed in: it never signed anyone out.
		const me = await clients.owner.fetch('/api/auth/get-session');
		expect(((await me.json()) as { user?: { email?: string } } | null)?.user?.email).toBe(DEMO.owner);
		expect(await footprint()).toEqual(before);
		// And the server is still there and well.
		expect((await new Client().fetch('/api/health')).status).toBe(200);
	});

	it('sends signed webhook events that are not events without a 5xx', async () => {
		const secret = process.env.STRIPE_WEBHOOK_SECRET ?? 'whsec_slateroom_test';
		const bodies = fc.sample(hostileJson, { seed: SEED, numRuns: 40 }).map((v) => JSON.stringify(v) ?? 'null');
		bodies.push(
			'not json',
			'{"id":"evt_fuzz","type":"checkout.session.completed"}',
			'{"id":"evt\\u0000","type":"x","data":{"object":{}}}'
		);
		// The types the endpoint acts on, each with hostile objects (ids of their own, so nothing matches).
		const acted = [
			'checkout.session.completed',
			'checkout.session.expired',
			'checkout.session.async_payment_failed',
			'refund.updated'
		];
		fc.sample(hostileJson, { seed: SEED + 1, numRuns: 24 }).forEach((object, i) => {
			const type = acted[i % acted.length];
			bodies.push(JSON.stringify({ id: `evt_fuzz_${SEED}_${i}`, type, data: { object } }));
			bodies.push(JSON.stringify({ id: `evt_fuzz_${SEED}_${i}_id`, type, data: { object: { id: object, metadata: object } } }));
		});
		const statuses: string[] = [];
		for (const body of bodies) {
			const t = Math.floor(Date.now() / 1000);
			const v1 = createHmac('sha256', secret).update(`${t}.${body}`).digest('hex');
			const res = await new Client().fetch('/api/stripe/webhook', {
				method: 'POST',
				headers: { 'content-type': 'application/json', 'stripe-signature': `t=${t},v1=${v1}` },
				body
			});
			if (res.status >= 500) statuses.push(`${res.status} ${show(body)} ${await res.text()}`);
		}
		expect(statuses, `seed ${SEED}`).toEqual([]);
	});
});
