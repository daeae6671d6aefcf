// Every route of the app, walked by each role of studio A against studio B's things. The routes
// are found from the src/routes folder, so a route added without an entry here fails the first
// test: nobody can add a page or an endpoint without saying how it keeps other studios out.
//
// Studio B is made here, unpublished, with one of everything (room, gear, closed days, a surcharge,
// a team, an artist, a confirmed session with a payment, a document, a recall sheet, an upload and
// a pending invitation), each named with a random marker. Each role of A then asks every route for
// B's things (in the address, the query, the form fields or the JSON body) and every answer must:
// - not be a server error;
// - be a refusal (403 or 404) where the address itself names B's thing;
// - contain none of B's markers, whatever its status;
// and at the end, nothing of B's may have changed (a digest of every row that carries its id).
// This is the check OWASP's testing guide calls "testing for insecure direct object references"
// (WSTG-ATHZ-04), done exhaustively over the route table rather than by sampling.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readdirSync, readFileSync, existsSync } from 'node:fs';
import { join, relative, sep } from 'node:path';
import { eq, sql } from 'drizzle-orm';
import { studioIdOf, testDb } from '../support/db';
import { DEMO } from '../support/env';
import { Client, signedIn } from '../support/http';
import { wav } from '../support/audio';
import * as t from '../../src/lib/server/db/schema';
import { connectStudio, settingsOf } from '../support/team';
import { issueDocument } from '../../src/lib/server/invoices/issue';
import { documentTotals, lumpSumLines } from '../../src/lib/domain/invoice';

const { db, client } = testDb();
const ROUTES = join(process.cwd(), 'src', 'routes');

// ——— The routes, as the folder says ———

interface FoundRoute {
	id: string;
	/** HTTP methods a +server.ts exports. */
	methods: string[];
	/** Form actions a +page.server.ts exports ('default' for an unnamed one); null when there is no page. */
	actions: string[] | null;
	/** Whether it renders a page (a folder of form actions alone does not). */
	hasPage: boolean;
}

function walkDir(dir: string): string[] {
	return readdirSync(dir, { withFileTypes: true }).flatMap((d) =>
		d.isDirectory() ? [dir + sep + d.name, ...walkDir(dir + sep + d.name)] : []
	);
}

function routeIdOf(dir: string): string {
	const parts = relative(ROUTES, dir)
		.split(sep)
		.filter((p) => p !== '' && !/^\(.*\)$/.test(p));
	return '/' + parts.join('/');
}

function discoverRoutes(): FoundRoute[] {
	const found: FoundRoute[] = [];
	for (const dir of [ROUTES, ...walkDir(ROUTES)]) {
		const server = join(dir, '+server.ts');
		const pageServer = join(dir, '+page.server.ts');
		// A page, or a folder whose only content is form actions (sign-out).
		const page = existsSync(join(dir, '+page.svelte')) || existsSync(pageServer);
		const methods = existsSync(server)
			? [...readFileSync(server, 'utf8').matchAll(/export (?:const|async function) (GET|POST|PUT|PATCH|DELETE)\b/g)].map(
					(m) => m[1]!
				)
			: [];
		let actions: string[] | null = null;
		if (page) {
			actions = [];
			if (existsSync(pageServer)) {
				const text = readFileSync(pageServer, 'utf8');
				const at = text.indexOf('export const actions');
				// The actions object's own keys sit one tab in.
				if (at >= 0) actions = [...text.slice(at).matchAll(/^\t([A-Za-z]+):/gm)].map((m) => m[1]!);
			}
		}
		if (methods.length || actions)
			found.push({ id: routeIdOf(dir), methods, actions, hasPage: existsSync(join(dir, '+page.svelte')) });
	}
	return found.sort((a, b) => a.id.localeCompare(b.id));
}

// ——— Studio B ———

interface B {
	id: string;
	slug: string;
	room: string;
	roomSlug: string;
	gear: string;
	blackout: string;
	surcharge: string;
	owner: string;
	engineer: string;
	artist: string;
	booking: string;
	reference: string;
	invoice: string;
	upload: string;
	invitation: string;
	/** Texts that exist only in B's rows: none may come back to anyone of A. */
	markers: string[];
}

type Body = Record<string, string> | [string, string][];

/**
 * How a route is asked for B's things. `path` fills the address; `into` says the address itself
 * names something of B's (so the answer must be 403 or 404); `form`/`json` give the body of each
 * action or method (a default is sent otherwise); `noPost` keeps a route's writes out of the walk,
 * with the reason.
 */
interface Entry {
	path: (b: B) => string;
	into: boolean;
	form?: Record<string, (b: B) => Body>;
	json?: Record<string, (b: B) => unknown>;
	noPost?: string;
	/** Bodies sent as multipart/form-data (a file), by method or action. */
	multipart?: Record<string, (b: B) => FormData>;
	/** Actions left out of the walk, each with the reason. */
	skip?: Record<string, string>;
}

/** A form with a small, valid WAV file in the field the upload endpoints read. */
function withFile(): FormData {
	const form = new FormData();
	form.set('file', new Blob([wav()], { type: 'audio/wav' }), 'walk.wav');
	return form;
}

const money = { hourly: '10.00', halfDay: '30.00', fullDay: '50.00' };
const B_IDS = (b: B): Body => ({ id: b.room, bookingId: b.booking, userId: b.owner, studio: b.slug, studioId: b.id });

const ENTRIES: Record<string, Entry> = {
	// The platform's own pages: they name no studio, so nothing of B may show in them.
	'/': { path: () => '/', into: false },
	'/sign-in': { path: () => '/sign-in', into: false, noPost: 'signing in as somebody else is the sign-in tests’ subject' },
	'/sign-up': { path: () => '/sign-up', into: false, noPost: 'making accounts is the sign-up tests’ subject' },
	'/sign-out': { path: () => '/sign-out', into: false, noPost: 'it would end the walking session; it names nothing of a studio' },
	'/studios/new': {
		path: () => '/studios/new',
		into: false,
		form: { create: (b) => ({ name: 'Taken over', slug: b.slug, country: 'FI', timeZone: 'Europe/Helsinki', currency: 'EUR' }) }
	},
	'/studios/new/slug': { path: (b) => `/studios/new/slug?slug=${b.slug}`, into: false },
	'/studio-switch': { path: () => '/studio-switch', into: false, form: { default: (b) => ({ studio: b.id, back: '/plan' }) } },
	'/invitations/[id=uuid]': {
		path: (b) => `/invitations/${b.invitation}`,
		into: true,
		form: { accept: () => ({}) }
	},
	'/feed/[token]/sessions.ics': { path: () => `/feed/${'0'.repeat(43)}/sessions.ics`, into: true },
	// B's storefront and studio API, by its short name: unpublished, so unknown to outsiders.
	'/[studio=studio]': { path: (b) => `/${b.slug}`, into: true },
	'/[studio=studio]/calendar': { path: (b) => `/${b.slug}/calendar`, into: true },
	'/[studio=studio]/rooms': { path: (b) => `/${b.slug}/rooms`, into: true },
	'/[studio=studio]/book': {
		path: (b) => `/${b.slug}/book?room=${b.roomSlug}`,
		into: true,
		form: { default: (b) => ({ room: b.roomSlug, date: B_DAY, start: '10:00', end: '12:00' }) }
	},
	'/api/studios': {
		path: () => '/api/studios',
		into: false,
		json: { POST: (b) => ({ name: 'Taken over', slug: b.slug, country: 'FI', timeZone: 'Europe/Helsinki', currency: 'EUR' }) }
	},
	'/api/studios/[studio=studio]/rooms': { path: (b) => `/api/studios/${b.slug}/rooms`, into: true },
	'/api/studios/[studio=studio]/availability': {
		path: (b) => `/api/studios/${b.slug}/availability?room=${b.roomSlug}&from=${B_DAY}&to=${B_DAY}`,
		into: true
	},
	'/api/studios/[studio=studio]/quote': {
		path: (b) => `/api/studios/${b.slug}/quote`,
		into: true,
		json: { POST: (b) => ({ room: b.roomSlug, start: `${B_DAY}T10:00`, end: `${B_DAY}T12:00` }) }
	},
	'/api/studios/[studio=studio]/bookings': {
		path: (b) => `/api/studios/${b.slug}/bookings`,
		into: true,
		json: { POST: (b) => ({ room: b.roomSlug, start: `${B_DAY}T10:00`, end: `${B_DAY}T12:00` }) }
	},
	'/api/studios/[studio=studio]/plan': { path: (b) => `/api/studios/${b.slug}/plan?date=${B_DAY}`, into: true },
	'/api/studios/[studio=studio]/invoices': {
		path: (b) => `/api/studios/${b.slug}/invoices?month=${B_DAY.slice(0, 7)}`,
		into: true
	},
	'/api/studios/[studio=studio]/invoices/export': {
		path: (b) => `/api/studios/${b.slug}/invoices/export?month=${B_DAY.slice(0, 7)}&format=csv`,
		into: true
	},
	// A person's own bookings, and one booking by its id.
	'/bookings': { path: () => '/bookings', into: false },
	// A person's own billing details: they name no studio. The walkers' writes are refused (a wrong
	// VAT ID, a missing name), so the demo accounts keep having none.
	'/account': {
		path: () => '/account',
		into: false,
		form: {
			default: () => ({
				kind: 'organisation',
				name: '',
				street: 'Walk street 1',
				postalCode: '00100',
				city: 'Helsinki',
				country: 'FI'
			})
		}
	},
	'/api/me/billing': {
		path: () => '/api/me/billing',
		into: false,
		json: {
			PUT: () => ({
				kind: 'organisation',
				name: 'Walk Oy',
				street: 'x',
				postalCode: '00100',
				city: 'Helsinki',
				country: 'FI',
				vatId: 'FI12345672'
			})
		}
	},
	'/bookings/[id=uuid]': {
		path: (b) => `/bookings/${b.booking}`,
		into: true,
		form: { remove: (b) => ({ id: b.upload, uploadId: b.upload }) },
		multipart: { upload: () => withFile() }
	},
	'/invoices/[id=uuid]/pdf': { path: (b) => `/invoices/${b.invoice}/pdf`, into: true },
	'/uploads/[id=uuid]': { path: (b) => `/uploads/${b.upload}`, into: true },
	'/api/bookings': { path: (b) => `/api/bookings?studio=${b.slug}`, into: true },
	'/api/bookings/[id=uuid]': { path: (b) => `/api/bookings/${b.booking}`, into: true },
	'/api/bookings/[id=uuid]/cancel': { path: (b) => `/api/bookings/${b.booking}/cancel`, into: true },
	'/api/bookings/[id=uuid]/cancel/retry': { path: (b) => `/api/bookings/${b.booking}/cancel/retry`, into: true },
	'/api/bookings/[id=uuid]/cancellation': { path: (b) => `/api/bookings/${b.booking}/cancellation`, into: true },
	'/api/bookings/[id=uuid]/close': { path: (b) => `/api/bookings/${b.booking}/close`, into: true },
	'/api/bookings/[id=uuid]/no-show': { path: (b) => `/api/bookings/${b.booking}/no-show`, into: true },
	'/api/bookings/[id=uuid]/move': {
		path: (b) => `/api/bookings/${b.booking}/move?start=2027-03-03T10:00&end=2027-03-03T12:00`,
		into: true,
		json: { POST: () => ({ start: '2027-03-03T10:00', end: '2027-03-03T12:00' }) }
	},
	'/api/bookings/[id=uuid]/payments': {
		path: (b) => `/api/bookings/${b.booking}/payments`,
		into: true,
		json: { POST: () => ({ amount: 1000, method: 'cash', paidOn: '2026-12-01', note: 'walk' }) }
	},
	'/api/bookings/[id=uuid]/payments/[paymentId=uuid]/reverse': {
		path: (b) => `/api/bookings/${b.booking}/payments/${crypto.randomUUID()}/reverse`,
		into: true,
		json: { POST: () => ({ reason: 'walk' }) }
	},
	'/api/bookings/[id=uuid]/pay': { path: (b) => `/api/bookings/${b.booking}/pay`, into: true },
	'/api/bookings/[id=uuid]/uploads': {
		path: (b) => `/api/bookings/${b.booking}/uploads`,
		into: true,
		multipart: { POST: () => withFile() }
	},
	'/api/bookings/[id=uuid]/uploads/[uploadId=uuid]': {
		path: (b) => `/api/bookings/${b.booking}/uploads/${b.upload}`,
		into: true
	},
	// The staff pages of the studio the walker works in, sent B's ids in queries and fields.
	'/studio': { path: () => '/studio', into: false },
	// Its filters name no studio; B's sessions must simply not be among the results.
	'/studio/bookings': { path: () => '/studio/bookings?status=confirmed', into: false },
	'/studio/people': {
		path: () => '/studio/people',
		into: false,
		form: {
			setRole: (b) => ({ userId: b.owner, role: 'accountant' }),
			remove: (b) => ({ userId: b.engineer }),
			invite: () => ({ email: A_INVITE, role: 'engineer' }),
			revoke: (b) => ({ invitationId: b.invitation }),
			resend: (b) => ({ invitationId: b.invitation })
		}
	},
	'/studio/rooms': {
		path: () => '/studio/rooms',
		into: false,
		form: {
			room: (b) => ({ id: b.room, name: 'Taken over', description: '', ...money, active: 'on' }),
			gear: (b) => ({ id: b.gear, name: 'Taken over', category: 'microphone', homeRoom: b.room, hireFee: '1.00' }),
			gearActive: (b) => ({ id: b.gear, active: 'false' }),
			blackout: () => ({ startsOn: '2099-01-01', endsOn: '2098-01-01', reason: 'refused range' }),
			removeBlackout: (b) => ({ id: b.blackout })
		}
	},
	'/studio/settings': {
		path: () => '/studio/settings',
		into: false,
		form: {
			save: () => ({ name: '' }),
			// An offset that is not among the choices: refused (422), so the walk changes nothing.
			reminders: () => ({ reminderHours: '5', directions: 'Taken over' }),
			surcharge: (b) => ({
				id: b.surcharge,
				label: 'Taken over',
				kind: 'window',
				percent: '50',
				weekdays: '1',
				from: '18:00',
				to: '24:00',
				active: 'on'
			})
		}
	},
	'/studio/setup': {
		path: () => '/studio/setup',
		into: false,
		form: {
			address: () => ({ step: 'address', street: '' }),
			policy: () => ({ step: 'policy' }),
			room: (b) => ({ id: b.room, name: 'Taken over', description: '', ...money, active: 'on' }),
			rooms: (b) => ({ id: b.room }),
			publish: (b) => ({ studio: b.id })
		}
	},
	'/studio/get-paid': {
		path: () => '/studio/get-paid',
		into: false,
		form: { start: (b) => ({ studio: b.id, account: b.id }) },
		skip: { start: 'it makes a payment account for the studio the walker works in, when it has none, and reads nothing posted' }
	},
	// Stripe sends the owner back to these two; both read and renew the walker's own studio's account only.
	'/studio/get-paid/return': { path: () => '/studio/get-paid/return', into: false },
	'/studio/get-paid/refresh': { path: () => '/studio/get-paid/refresh', into: false },
	'/plan': {
		path: () => `/plan?date=${B_DAY}`,
		into: false,
		form: { feed: () => ({}), recall: (b) => ({ bookingId: b.booking, rows: '0', notes: 'Taken over' }) }
	},
	'/accounts': { path: () => `/accounts?month=${B_DAY.slice(0, 7)}`, into: false },
	'/api/health': { path: () => '/api/health', into: false },
	'/api/stripe/webhook': {
		path: () => '/api/stripe/webhook',
		into: false,
		// Unsigned: the provider's signature is what lets an event in, and nothing of a person's role.
		json: { POST: (b) => ({ type: 'checkout.session.completed', data: { object: { metadata: { bookingId: b.booking } } } }) }
	},
	'/api/stripe/connect-webhook': {
		path: () => '/api/stripe/connect-webhook',
		into: false,
		// The Connect endpoint alike: unsigned, nothing gets in.
		json: {
			POST: (b) => ({
				type: 'checkout.session.completed',
				account: 'acct_walk',
				data: { object: { metadata: { bookingId: b.booking } } }
			})
		}
	}
};

/** A day far ahead that nothing else books: B's session is on it. */
const B_DAY = '2031-03-04';

// ——— Making B, and a digest of it ———

const mark = `Zq${crypto.randomUUID().slice(0, 8)}`;
/** Whom A's owner invites during the walk (into A: nothing of B's). */
const A_INVITE = `${mark.toLowerCase()}-a@walk.slateroom.test`;
let b: B;

async function person(label: string): Promise<string> {
	const id = crypto.randomUUID();
	await db.insert(t.user).values({
		id,
		name: `${label} ${mark}`,
		email: `${mark.toLowerCase()}-${label.toLowerCase().replace(/\W+/g, '-')}@walk.slateroom.test`
	});
	return id;
}

async function makeStudioB(): Promise<B> {
	const id = crypto.randomUUID();
	const slug = `walk-${mark.toLowerCase()}`;
	const name = `Studio ${mark}`;
	await db.insert(t.organization).values({ id, name, slug });
	const [demo] = await db
		.select()
		.from(t.studio)
		.where(eq(t.studio.id, await studioIdOf(db)));
	const settings = settingsOf(demo!);
	await db
		.insert(t.studio)
		.values({ ...settings, id, name, published: false, email: `${mark.toLowerCase()}@walk.slateroom.test` });
	await connectStudio(db, id);
	const owner = await person('Owner');
	const engineer = await person('Engineer');
	const artist = await person('Artist');
	await db.insert(t.member).values([
		{ id: crypto.randomUUID(), organizationId: id, userId: owner, role: 'owner' },
		{ id: crypto.randomUUID(), organizationId: id, userId: engineer, role: 'engineer' }
	]);
	const roomSlug = `room-${mark.toLowerCase()}`;
	const [room] = await db
		.insert(t.room)
		.values({ studioId: id, slug: roomSlug, name: `Room ${mark}`, hourly: 1000, halfDay: 3000, fullDay: 5000, active: true })
		.returning();
	const [gear] = await db
		.insert(t.gearItem)
		.values({
			studioId: id,
			name: `Microphone ${mark}`,
			category: 'microphone',
			homeRoomId: room!.id,
			hireable: true,
			hireFee: 500
		})
		.returning();
	const [blackout] = await db
		.insert(t.blackout)
		.values({ studioId: id, startsOn: '2031-04-01', endsOn: '2031-04-02', reason: `Closed ${mark}` })
		.returning();
	const [surcharge] = await db
		.insert(t.surchargeRule)
		.values({
			studioId: id,
			label: `Late ${mark}`,
			kind: 'window',
			percentBp: 2000,
			weekdays: [1],
			fromMinute: 1200,
			toMinute: 1440
		})
		.returning();
	const reference = `WK-${mark.slice(2, 6).toUpperCase()}-${mark.slice(6, 10).toUpperCase()}`;
	const [booking] = await db
		.insert(t.booking)
		.values({
			studioId: id,
			reference,
			roomId: room!.id,
			artistId: artist,
			engineerId: engineer,
			startsAt: new Date(`${B_DAY}T10:00:00Z`),
			endsAt: new Date(`${B_DAY}T12:00:00Z`),
			busyUntil: new Date(`${B_DAY}T12:00:00Z`),
			status: 'confirmed',
			quote: {},
			currency: 'EUR',
			total: 2000,
			deposit: 500,
			notes: `Notes ${mark}`
		})
		.returning();
	await db
		.insert(t.payment)
		.values({ studioId: id, bookingId: booking!.id, kind: 'deposit', amount: 500, currency: 'EUR', status: 'paid' });
	const lines = lumpSumLines(500, 'deposit', `Deposit ${mark}`, [{ rateBp: 2550, weight: 1 }]);
	const totals = documentTotals(lines, { currency: 'EUR', amountsIncludeVat: true, prepaid: 500 });
	const { invoice } = await db.transaction((tx) =>
		issueDocument(tx, {
			studioId: id,
			typeCode: 386,
			series: 'WK',
			issuedAt: new Date(`${B_DAY}T09:00:00Z`),
			timeZone: settings.timeZone,
			supplyDate: B_DAY,
			supplier: { name, addressLines: [] },
			customer: { name: `Artist ${mark}`, addressLines: [] },
			bookingId: booking!.id,
			totals
		})
	);
	await db
		.insert(t.recallSheet)
		.values({ studioId: id, bookingId: booking!.id, artistId: artist, authorId: engineer, notes: `Recall ${mark}` });
	const [upload] = await db
		.insert(t.upload)
		.values({
			studioId: id,
			bookingId: booking!.id,
			uploaderId: artist,
			originalName: `demo-${mark}.wav`,
			storageKey: `walk/${mark}`,
			contentType: 'audio/wav',
			sizeBytes: 44,
			sha256: '0'.repeat(64)
		})
		.returning();
	const invitation = crypto.randomUUID();
	await db.insert(t.invitation).values({
		id: invitation,
		organizationId: id,
		email: `${mark.toLowerCase()}-invited@walk.slateroom.test`,
		role: 'engineer',
		expiresAt: new Date(Date.now() + 7 * 86_400_000),
		inviterId: owner
	});
	return {
		id,
		slug,
		room: room!.id,
		roomSlug,
		gear: gear!.id,
		blackout: blackout!.id,
		surcharge: surcharge!.id,
		owner,
		engineer,
		artist,
		booking: booking!.id,
		reference,
		invoice: invoice.id,
		upload: upload!.id,
		invitation,
		markers: [
			name,
			`Room ${mark}`,
			`Microphone ${mark}`,
			`Closed ${mark}`,
			`Late ${mark}`,
			`Artist ${mark}`,
			`Owner ${mark}`,
			`Engineer ${mark}`,
			reference,
			invoice.displayNumber,
			`Recall ${mark}`,
			`demo-${mark}`,
			`Notes ${mark}`,
			`Deposit ${mark}`,
			`${mark.toLowerCase()}-invited`
		]
	};
}

/** The tables whose rows carry a studio, as the database lists them. */
async function studioTables(): Promise<string[]> {
	const rows = await client<{ table_name: string }[]>`
		select c.table_name from information_schema.columns c
		join information_schema.tables t using (table_schema, table_name)
		where c.table_schema = 'public' and c.column_name = 'studio_id' and t.table_type = 'BASE TABLE'
		order by c.table_name`;
	return rows.map((r) => r.table_name);
}

/** One digest per table of every row of B's (and its organization, team and invitations). */
async function digestOf(studioId: string): Promise<Record<string, string>> {
	const out: Record<string, string> = {};
	const tables = [
		...(await studioTables()).map((name) => [name, 'studio_id'] as const),
		['organization', 'id'],
		['studio', 'id'],
		['member', 'organization_id'],
		['invitation', 'organization_id']
	] as const;
	for (const [table, column] of tables) {
		const [row] = await client<{ d: string | null }[]>`
			select md5(string_agg(x::text, '|' order by x::text)) as d from ${client(table)} x where ${client(column)} = ${studioId}`;
		out[table] = row?.d ?? 'none';
	}
	return out;
}

// ——— The walk ———

const ROLES = ['owner', 'engineer', 'accountant', 'artist'] as const;
const clients = {} as Record<(typeof ROLES)[number], Client>;
let before: Record<string, string>;

beforeAll(async () => {
	b = await makeStudioB();
	before = await digestOf(b.id);
	for (const role of ROLES) clients[role] = await signedIn(DEMO[role]);
});

afterAll(async () => {
	try {
		// B stays, unpublished and on a far day: its issued document can never be deleted (documents
		// are kept as issued), and so neither can its session or the studio. Only what A's owner
		// made during the walk goes.
		await db.delete(t.invitation).where(eq(t.invitation.email, A_INVITE));
	} finally {
		await client.end();
	}
});

const routes = discoverRoutes();

describe('the route table', () => {
	it('has an entry for every route in src/routes, and none for a route that is gone', () => {
		const ids = routes.map((r) => r.id);
		expect(
			ids.filter((id) => !(id in ENTRIES)),
			'routes without an entry'
		).toEqual([]);
		expect(
			Object.keys(ENTRIES).filter((id) => !ids.includes(id)),
			'entries without a route'
		).toEqual([]);
	});
});

/** Every request of the walk: a route, a method or action, and what to send. */
interface Step {
	route: string;
	label: string;
	send: (c: Client) => Promise<Response>;
}

function stepsOf(route: FoundRoute, entry: Entry, theirs: B): Step[] {
	const path = entry.path(theirs);
	const steps: Step[] = [];
	const get = (label: string) => ({
		route: route.id,
		label,
		send: (c: Client) => c.fetch(path, { headers: { accept: 'text/html,application/json' } })
	});
	if (route.hasPage) steps.push(get('GET page'));
	for (const method of route.methods) {
		if (method === 'GET') {
			steps.push(get('GET'));
			continue;
		}
		if (entry.noPost) continue;
		const files = entry.multipart?.[method];
		if (files) {
			steps.push({ route: route.id, label: method, send: (c) => c.fetch(path, { method, body: files(theirs) }) });
			continue;
		}
		const body = entry.json?.[method]?.(theirs) ?? { bookingId: theirs.booking, room: theirs.roomSlug, studio: theirs.slug };
		steps.push({ route: route.id, label: method, send: (c) => c.json(path, body, method) });
	}
	if (route.actions && !entry.noPost) {
		for (const action of route.actions) {
			if (entry.skip?.[action]) continue;
			const target = action === 'default' ? path : `${path}${path.includes('?') ? '&' : '?'}/${action}`;
			const files = entry.multipart?.[action];
			if (files) {
				steps.push({
					route: route.id,
					label: `action ${action}`,
					send: (c) => c.fetch(target, { method: 'POST', headers: { accept: 'text/html' }, body: files(theirs) })
				});
				continue;
			}
			const fields = entry.form?.[action]?.(theirs) ?? B_IDS(theirs);
			steps.push({ route: route.id, label: `action ${action}`, send: (c) => c.form(target, fields) });
		}
	}
	return steps;
}

describe("studio A's people, walking every route against studio B", () => {
	it('gets nothing of B back, and changes nothing of B', async () => {
		const failures: string[] = [];
		let pairs = 0;
		for (const route of routes) {
			const entry = ENTRIES[route.id];
			if (!entry) continue;
			for (const step of stepsOf(route, entry, b)) {
				for (const role of ROLES) {
					pairs++;
					const res = await step.send(clients[role]);
					const type = res.headers.get('content-type') ?? '';
					const text = type.includes('pdf') || type.includes('zip') ? '' : await res.text();
					const where = `${role} ${step.label} ${route.id} → ${res.status}`;
					if (res.status >= 500) failures.push(`${where}: a server error`);
					if (entry.into && res.status !== 403 && res.status !== 404) failures.push(`${where}: not refused`);
					const leaked = b.markers.filter((m) => text.includes(m));
					if (leaked.length) failures.push(`${where}: shows ${leaked.join(', ')}`);
				}
			}
		}
		console.info(`route walk: ${routes.length} routes, ${pairs} route × method × role requests`);
		expect(failures).toEqual([]);
		expect(await digestOf(b.id)).toEqual(before);
		// The walkers are still who they were (no request moved them into B's team).
		const [{ n } = { n: -1 }] = await db
			.select({ n: sql<number>`count(*)::int` })
			.from(t.member)
			.where(eq(t.member.organizationId, b.id));
		expect(n).toBe(2);
	});
});
