// The owner's Rates & policy page over real HTTP: plain form posts (as a browser without
// JavaScript sends them), exact minor units in the database, the live quote following the new
// rates, bookings keeping their quoted price, and other roles turned away.
// Every setting changed here is put back afterwards: other spec files rely on the demo rates.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { desc, eq } from 'drizzle-orm';
import { Client, signedIn } from '../support/http';
import { DEMO } from '../support/env';
import { studioIdOf, testDb } from '../support/db';
import { workdaysAhead } from '../support/dates';
import { expectRefusedPage } from '../support/refusal';
import * as t from '../../src/lib/server/db/schema';
import { settingsFormFrom, type SettingsForm } from '../../src/routes/(studio)/studio/settings/schema';
import { DEMO_POLICY } from '../../src/lib/domain/demo';

const { db, client } = testDb();

// This file's days, one test to a day: working weekdays from 170 days ahead, later than any other
// spec file books and inside the demo's 180-day horizon.
const OWN_DAYS = workdaysAhead(170, 4);

type StudioRow = typeof t.studio.$inferSelect;
let original: StudioRow;
let originalSurcharges: (typeof t.surchargeRule.$inferSelect)[];
let originalRooms: (typeof t.room.$inferSelect)[];
let originalGearIds: Set<string>;
let owner: Client;

async function studioRow(): Promise<StudioRow> {
	const [row] = await db
		.select()
		.from(t.studio)
		.where(eq(t.studio.id, await studioIdOf(db)));
	return row!;
}

/** The settings form as the page would post it: the stored values, with some fields changed. */
function fields(row: StudioRow, change: Partial<Record<keyof SettingsForm, string | string[]>> = {}): [string, string][] {
	const form = { ...settingsFormFrom(row, row.currency), ...change } as Record<string, unknown>;
	const out: [string, string][] = [];
	for (const [name, value] of Object.entries(form)) {
		if (typeof value === 'boolean') {
			if (value) out.push([name, 'on']);
		} else if (Array.isArray(value)) {
			for (const v of value) out.push([name, String(v)]);
		} else out.push([name, String(value)]);
	}
	return out;
}

/** Compares what matters of the row (updatedAt moves on any write). */
const policyOf = ({ updatedAt: _u, ...rest }: StudioRow) => rest;

async function quote(body: unknown) {
	const res = await new Client().json('/api/studios/hollow-pine/quote', body);
	return { status: res.status, body: (await res.json()) as { total: number; lines: { key: string; amount: number }[] } };
}

beforeAll(async () => {
	original = await studioRow();
	originalSurcharges = await db.select().from(t.surchargeRule);
	originalRooms = await db.select().from(t.room);
	originalGearIds = new Set((await db.select({ id: t.gearItem.id }).from(t.gearItem)).map((g) => g.id));
	owner = await signedIn(DEMO.owner);
});

afterAll(async () => {
	// Put back every setting, whatever the tests did or failed to do.
	try {
		const { id: _id, updatedAt: _u, ...values } = original;
		await db
			.update(t.studio)
			.set(values)
			.where(eq(t.studio.id, await studioIdOf(db)));
		const keep = new Set(originalSurcharges.map((s) => s.id));
		for (const s of await db.select().from(t.surchargeRule)) {
			if (!keep.has(s.id)) await db.delete(t.surchargeRule).where(eq(t.surchargeRule.id, s.id));
		}
		for (const s of originalSurcharges) await db.update(t.surchargeRule).set(s).where(eq(t.surchargeRule.id, s.id));
		for (const { updatedAt: _ru, ...r } of originalRooms) await db.update(t.room).set(r).where(eq(t.room.id, r.id));
		for (const g of await db.select({ id: t.gearItem.id }).from(t.gearItem)) {
			if (!originalGearIds.has(g.id)) await db.delete(t.gearItem).where(eq(t.gearItem.id, g.id));
		}
	} finally {
		await client.end();
	}
});

describe('Rates & policy page', () => {
	it('shows the owner the demo studio’s values and says bookings keep their price', async () => {
		const res = await owner.fetch('/studio/settings', { headers: { accept: 'text/html' } });
		expect(res.status).toBe(200);
		const html = await res.text();
		// Engineer 35.00 / 120.00 / 230.00, VAT 25.5 %, deposit 30 % and at least 50.00.
		for (const value of ['value="35.00"', 'value="120.00"', 'value="230.00"', 'value="25.5"', 'value="30"', 'value="50.00"']) {
			expect(html).toContain(value);
		}
		expect(html).toContain('keeps the price');
	});

	it('stores a new engineer rate exactly in minor units; new quotes use it, an existing booking keeps its quote', async () => {
		const day = OWN_DAYS[0]!;
		const body = { room: 'live-room', start: `${day}T09:00`, end: `${day}T13:00`, engineer: true };
		// Demo rates: live room half day 160.00 + engineer half day 120.00.
		expect((await quote(body)).body.total).toBe(16000 + 12000);

		const artist = await signedIn(DEMO.artist);
		const made = await artist.json('/api/studios/hollow-pine/bookings', body);
		expect(made.status).toBe(201);
		const booked = (await made.json()) as { id: string };
		const [before] = await db.select().from(t.booking).where(eq(t.booking.id, booked.id));
		try {
			const res = await owner.form(
				'/studio/settings?/save',
				fields(original, { engineerHalfDay: '123.45', engineerHourly: '35.1' })
			);
			expect(res.status).toBe(200);
			expect(await res.text()).toContain('Saved.');
			const row = await studioRow();
			expect(row.engineerHalfDay).toBe(12345);
			expect(row.engineerHourly).toBe(3510);
			expect(policyOf({ ...row, engineerHalfDay: original.engineerHalfDay, engineerHourly: original.engineerHourly })).toEqual(
				policyOf(original)
			);

			expect((await quote(body)).body.total).toBe(16000 + 12345);

			// The booking made before the change keeps its quote and totals (the price shown is the price paid).
			const [after] = await db.select().from(t.booking).where(eq(t.booking.id, booked.id));
			expect(after!.quote).toEqual(before!.quote);
			expect(after!.total).toBe(before!.total);
			const seen = (await (await artist.fetch(`/api/bookings/${booked.id}`)).json()) as { total: number };
			expect(seen.total).toBe(16000 + 12000);

			const [entry] = await db
				.select()
				.from(t.auditLog)
				.where(eq(t.auditLog.action, 'studio.policy_changed'))
				.orderBy(desc(t.auditLog.id))
				.limit(1);
			expect(entry!.data).toMatchObject({ engineerHalfDay: { from: 12000, to: 12345 } });
		} finally {
			await owner.form('/studio/settings?/save', fields(original));
			await db.update(t.booking).set({ status: 'cancelled', cancelledAt: new Date() }).where(eq(t.booking.id, booked.id));
		}
		const restored = await studioRow();
		expect(policyOf(restored)).toEqual(policyOf(original));
	});

	it.each([
		['engineerHourly', { engineerHourly: '12,5x' }, 'digits and a point', '12,5x'],
		['engineerFullDay', { engineerFullDay: '-230.00' }, 'cannot be negative', '-230.00'],
		['depositMinimum', { depositMinimum: '50.005' }, 'at most 2 decimals', '50.005'],
		['depositPercent', { depositPercent: '150' }, 'at most 100 %', '150'],
		['vatPercent', { vatPercent: 'lots' }, 'digits and a point', 'lots'],
		['minBookingMinutes', { minBookingMinutes: '100' }, 'whole number of 30-minute increments', '100'],
		['opens', { opens: ['09:00', '9am', '09:00', '09:00', '09:00', '09:00', '09:00'] }, 'a time such as 09:00', '9am'],
		[
			'refundPercents',
			{ noticeHours: ['168', '48', '0', ''], refundPercents: ['100', '50', '120', ''] },
			'from 0 to 100 %',
			'120'
		]
	] as const)(
		'refuses a bad %s with 422, its message and the value kept, and changes nothing',
		async (_field, change, words, kept) => {
			const before = await studioRow();
			const res = await owner.form(
				'/studio/settings?/save',
				fields(before, change as Partial<Record<keyof SettingsForm, string | string[]>>)
			);
			expect(res.status).toBe(422);
			const html = await res.text();
			expect(html).toContain(words);
			expect(html).toContain('Nothing was saved');
			// What the owner typed comes back in the field.
			expect(html).toContain(`value="${kept}"`);
			const after = await studioRow();
			expect(policyOf(after)).toEqual(policyOf(before));
			expect(after.updatedAt.getTime()).toBe(before.updatedAt.getTime());
		}
	);

	it.each([
		[{ engineerHalfDay: '250.00' }, 'engineerHalfDay', 'costs more than the full day', '250.00'],
		[{ engineerFullDay: '2300.00' }, 'engineerFullDay', '8 times what its 8 h cost by the hour', '2300.00']
	] as const)(
		'refuses an engineer rate card that contradicts itself (%o) field by field',
		async (change, _field, words, kept) => {
			const before = await studioRow();
			const res = await owner.form('/studio/settings?/save', fields(before, change));
			expect(res.status).toBe(422);
			const html = await res.text();
			expect(html).toContain(words);
			expect(html).toContain('Nothing was saved');
			expect(html).toContain(`value="${kept}"`);
			expect(policyOf(await studioRow())).toEqual(policyOf(before));
		}
	);

	it('saves an odd engineer rate card and notes what is odd beside the field', async () => {
		try {
			// 4 h at 35.00 is 140.00: a half day of 150.00 is never chosen, but it may be meant.
			const res = await owner.form('/studio/settings?/save', fields(original, { engineerHalfDay: '150.00' }));
			expect(res.status).toBe(200);
			const html = await res.text();
			expect(html).toContain('Saved.');
			expect(html).toContain('Some engineer rates look odd');
			expect((await studioRow()).engineerHalfDay).toBe(15000);
			const page = await (await owner.fetch('/studio/settings', { headers: { accept: 'text/html' } })).text();
			expect(page).toContain('data-testid="field-warning"');
			expect(page).toContain('The half day (€150.00) costs more than its 4 h by the hour (€140.00), so it is never chosen');
		} finally {
			await owner.form('/studio/settings?/save', fields(original));
		}
		expect(policyOf(await studioRow())).toEqual(policyOf(original));
	});

	it('saves a surcharge change and puts it back', async () => {
		const [evening] = await db.select().from(t.surchargeRule).where(eq(t.surchargeRule.label, DEMO_POLICY.surcharges[0]!.label));
		expect(evening).toBeDefined();
		const post = (percent: string) =>
			owner.form('/studio/settings?/surcharge', [
				['__superform_id', `surcharge-${evening!.id}`],
				['id', evening!.id],
				['label', evening!.label],
				['kind', 'window'],
				['percent', percent],
				...evening!.weekdays.map((d): [string, string] => ['weekdays', String(d)]),
				['from', '18:00'],
				['to', '23:00'],
				['active', 'on']
			]);
		expect((await post('26.75')).status).toBe(200);
		const [changed] = await db.select().from(t.surchargeRule).where(eq(t.surchargeRule.id, evening!.id));
		expect(changed!.percentBp).toBe(2675);
		expect((await post('-5')).status).toBe(422);
		// Above 100 % is odd, not impossible: saved, with a note beside the percent.
		const steep = await post('150');
		expect(steep.status).toBe(200);
		expect(await steep.text()).toContain('It looks odd: see the note beside it.');
		const warned = await (await owner.fetch('/studio/settings', { headers: { accept: 'text/html' } })).text();
		expect(warned).toContain('+150 % is above 100 %: it more than doubles the price of every minute it covers.');
		expect((await post('25')).status).toBe(200);
		const [back] = await db.select().from(t.surchargeRule).where(eq(t.surchargeRule.id, evening!.id));
		expect(back).toEqual(evening);

		const add = await owner.form('/studio/settings?/surcharge', [
			['__superform_id', 'surcharge-new'],
			['label', 'Night owl'],
			['kind', 'window'],
			['percent', '12.5'],
			['weekdays', '5'],
			['weekdays', '6'],
			['from', '22:00'],
			['to', '02:00']
		]);
		expect(add.status).toBe(200);
		expect(await add.text()).toContain('Night owl added. It looks odd: see the note beside it.');
		// The window ends before it starts: the page says it runs past midnight and how long it lasts.
		const page = await (await owner.fetch('/studio/settings', { headers: { accept: 'text/html' } })).text();
		expect(page).toContain('runs past midnight: 22:00 to 02:00 the next morning, 4 h a night');
		const [night] = await db.select().from(t.surchargeRule).where(eq(t.surchargeRule.label, 'Night owl'));
		// Unticked "In use" arrives as no field at all: the new rule is paused, so no price changes.
		expect(night).toMatchObject({ percentBp: 1250, weekdays: [5, 6], fromMinute: 22 * 60, toMinute: 2 * 60, active: false });
		await db.delete(t.surchargeRule).where(eq(t.surchargeRule.id, night!.id));
	});
});

describe('only the owner', () => {
	it.each([DEMO.artist, DEMO.engineer])('%s gets 403 on the page and its actions', async (email) => {
		const who = await signedIn(email);
		const before = await studioRow();
		// The page and its actions say no, and show nothing of the policy (the engineer's rate, 35.00).
		const secrets = ['35.00', 'Evening surcharge'];
		await expectRefusedPage(
			await who.fetch('/studio/settings', { headers: { accept: 'text/html' } }),
			403,
			/Your role does not give access/,
			secrets
		);
		await expectRefusedPage(
			await who.form('/studio/settings?/save', fields(before, { engineerHourly: '1.00' })),
			403,
			/Your role does not give access/,
			secrets
		);
		await expectRefusedPage(
			await who.form('/studio/settings?/surcharge', [
				['label', 'Sneaky'],
				['percent', '90'],
				['kind', 'holiday']
			]),
			403,
			/Your role does not give access/,
			secrets
		);
		expect(policyOf(await studioRow())).toEqual(policyOf(before));
		expect(await db.select().from(t.surchargeRule).where(eq(t.surchargeRule.label, 'Sneaky'))).toEqual([]);
	});

	it('a visitor who is not signed in is sent to sign in', async () => {
		const res = await new Client().form('/studio/settings?/save', fields(original));
		// Form actions in the owner's zone send a stranger to sign in and back (src/hooks.server.ts).
		expect(res.status).toBe(303);
		expect(res.headers.get('location')).toBe(`/sign-in?next=${encodeURIComponent('/studio/settings?/save')}`);
		expect(policyOf(await studioRow())).toEqual(policyOf(original));
	});
});

describe('Rooms & gear page', () => {
	const live = () => originalRooms.find((r) => r.slug === 'live-room')!;
	const roomFields = (change: Record<string, string> = {}): [string, string][] =>
		Object.entries({
			__superform_id: `room-${live().id}`,
			id: live().id,
			name: live().name,
			description: live().description,
			hourly: '45.00',
			halfDay: '160.00',
			fullDay: '300.00',
			active: 'on',
			...change
		});

	it('shows the rate cards and the gear list with its safety cautions', async () => {
		const res = await owner.fetch('/studio/rooms', { headers: { accept: 'text/html' } });
		expect(res.status).toBe(200);
		const html = await res.text();
		expect(html).toContain('value="160.00"');
		expect(html).toContain('Ribbon microphone, figure-of-eight');
		expect(html).toContain('never send phantom power');
		expect(html).toContain('48 V phantom power');
	});

	it('stores a room rate exactly; the public rates and new quotes follow; then it goes back', async () => {
		const day = OWN_DAYS[1]!;
		const body = { room: 'live-room', start: `${day}T09:00`, end: `${day}T13:00` };
		try {
			const res = await owner.form('/studio/rooms?/room', roomFields({ halfDay: '161.05' }));
			expect(res.status).toBe(200);
			const [row] = await db.select().from(t.room).where(eq(t.room.id, live().id));
			expect(row!.halfDay).toBe(16105);
			const rooms = (await (await new Client().fetch('/api/studios/hollow-pine/rooms')).json()) as {
				rooms: { slug: string; rates: { halfDay: number } }[];
			};
			expect(rooms.rooms.find((r) => r.slug === 'live-room')!.rates.halfDay).toBe(16105);
			expect((await quote(body)).body.total).toBe(16105);
		} finally {
			expect((await owner.form('/studio/rooms?/room', roomFields())).status).toBe(200);
		}
		const [back] = await db.select().from(t.room).where(eq(t.room.id, live().id));
		expect(back!.halfDay).toBe(16000);
		expect((await quote(body)).body.total).toBe(16000);
	});

	it.each([
		['hourly', '12,5x', 'digits and a point'],
		['fullDay', '-1', 'cannot be negative'],
		['name', '', 'Name the room']
	])('refuses a bad %s with 422 and changes nothing', async (field, value, words) => {
		const res = await owner.form('/studio/rooms?/room', roomFields({ [field]: value }));
		expect(res.status).toBe(422);
		expect(await res.text()).toContain(words);
		const [row] = await db.select().from(t.room).where(eq(t.room.id, live().id));
		expect({ ...row, updatedAt: undefined }).toEqual({ ...live(), updatedAt: undefined });
	});

	it.each([
		['halfDay', { halfDay: '310.00' }, 'The half day (€310.00) costs more than the full day (€300.00)', '310.00'],
		[
			'halfDay',
			{ halfDay: '1600.00', fullDay: '3000.00' },
			'The half day (€1,600.00) costs 8 times what its 4 h cost',
			'1600.00'
		],
		['hourly', { hourly: '4.50' }, 'costs 8 times what its 4 h cost by the hour (€18.00)', '4.50']
	])('refuses a %s that can only be a typo (%o), the values kept, nothing stored', async (_field, change, words, kept) => {
		const res = await owner.form('/studio/rooms?/room', roomFields(change));
		expect(res.status).toBe(422);
		const html = await res.text();
		expect(html).toContain(words);
		expect(html).toContain('Not saved: check the marked fields.');
		expect(html).toContain(`value="${kept}"`);
		const [row] = await db.select().from(t.room).where(eq(t.room.id, live().id));
		expect({ ...row, updatedAt: undefined }).toEqual({ ...live(), updatedAt: undefined });
	});

	it('saves an odd room rate card and notes beside each field what is odd', async () => {
		try {
			// 4 h at 45.00 is 180.00: a half day of 190.00 is never chosen, but it may be meant.
			const res = await owner.form('/studio/rooms?/room', roomFields({ halfDay: '190.00' }));
			expect(res.status).toBe(200);
			expect(await res.text()).toContain('Some rates look odd: see the notes beside them.');
			const [row] = await db.select().from(t.room).where(eq(t.room.id, live().id));
			expect(row!.halfDay).toBe(19000);
			const page = await (await owner.fetch('/studio/rooms', { headers: { accept: 'text/html' } })).text();
			expect(page).toContain('The half day (€190.00) costs more than its 4 h by the hour (€180.00), so it is never chosen');
		} finally {
			expect((await owner.form('/studio/rooms?/room', roomFields())).status).toBe(200);
		}
		const [back] = await db.select().from(t.room).where(eq(t.room.id, live().id));
		expect(back!.halfDay).toBe(16000);
	});

	it('adds gear by type with a caution, edits it and retires it', async () => {
		const gearForm = (change: Record<string, string> = {}): [string, string][] =>
			Object.entries({
				__superform_id: 'gear-new',
				id: '',
				name: 'Test ribbon, figure-of-eight',
				category: 'microphone',
				homeRoom: live().id,
				hireFee: '12.5',
				hireable: 'on',
				description: '',
				notes: '',
				caution: 'Ribbon element: never send phantom power to it.',
				...change
			});
		expect((await owner.form('/studio/rooms?/gear', gearForm({ hireFee: '1.005' }))).status).toBe(422);
		expect((await owner.form('/studio/rooms?/gear', gearForm())).status).toBe(200);
		const [added] = await db.select().from(t.gearItem).where(eq(t.gearItem.name, 'Test ribbon, figure-of-eight'));
		expect(added).toMatchObject({ hireFee: 1250, hireable: true, homeRoomId: live().id, active: true, category: 'microphone' });

		const edit = await owner.form(
			'/studio/rooms?/gear',
			gearForm({ __superform_id: `gear-${added!.id}`, id: added!.id, hireFee: '20' })
		);
		expect(edit.status).toBe(200);
		const [edited] = await db.select().from(t.gearItem).where(eq(t.gearItem.id, added!.id));
		expect(edited!.hireFee).toBe(2000);

		expect((await owner.form('/studio/rooms?/gearActive', { id: added!.id, active: 'false' })).status).toBe(200);
		const [retired] = await db.select().from(t.gearItem).where(eq(t.gearItem.id, added!.id));
		expect(retired!.active).toBe(false);
		// Retired gear is no longer offered: a quote that asks for it is refused.
		const day = OWN_DAYS[1]!;
		const res = await quote({ room: 'live-room', start: `${day}T09:00`, end: `${day}T13:00`, gear: [added!.id] });
		expect(res.status).toBe(422);
	});

	it.each([DEMO.artist, DEMO.engineer])('%s gets 403 on the rooms page and its actions', async (email) => {
		const who = await signedIn(email);
		const words = /Your role does not give access/;
		// Nothing of the gear list or the rate cards in the refusal.
		const secrets = ['Ribbon microphone', 'value="160.00"'];
		await expectRefusedPage(await who.fetch('/studio/rooms', { headers: { accept: 'text/html' } }), 403, words, secrets);
		await expectRefusedPage(await who.form('/studio/rooms?/room', roomFields({ hourly: '1.00' })), 403, words, secrets);
		await expectRefusedPage(await who.form('/studio/rooms?/gearActive', { id: live().id, active: 'false' }), 403, words, secrets);
		const [row] = await db.select().from(t.room).where(eq(t.room.id, live().id));
		expect(row!.hourly).toBe(4500);
	});
});

describe('Blackout days', () => {
	it('warns about confirmed bookings on those days, never cancels them, and closes the day on /api/studios/hollow-pine/availability', async () => {
		const day = OWN_DAYS[2]!;
		const artist = await signedIn(DEMO.artist);
		const made = await artist.json('/api/studios/hollow-pine/bookings', {
			room: 'vocal-booth',
			start: `${day}T09:00`,
			end: `${day}T13:00`
		});
		expect(made.status).toBe(201);
		const { id } = (await made.json()) as { id: string };
		// Stands for a paid deposit: the payment flow is not what this test is about.
		await db.update(t.booking).set({ status: 'confirmed', holdExpiresAt: null }).where(eq(t.booking.id, id));
		const [b] = await db.select().from(t.booking).where(eq(t.booking.id, id));
		try {
			const warned = await owner.form('/studio/rooms?/blackout', { startsOn: day, endsOn: '', reason: 'Test blackout' });
			expect(warned.status).toBe(409);
			const html = await warned.text();
			expect(html).toContain(b!.reference);
			expect(html).toContain('will not be cancelled');
			expect(html).toContain('value="Test blackout"');
			expect(await db.select().from(t.blackout).where(eq(t.blackout.reason, 'Test blackout'))).toEqual([]);

			const added = await owner.form('/studio/rooms?/blackout', {
				startsOn: day,
				endsOn: '',
				reason: 'Test blackout',
				confirm: 'yes'
			});
			expect(added.status).toBe(200);
			const [row] = await db.select().from(t.blackout).where(eq(t.blackout.reason, 'Test blackout'));
			expect(row).toMatchObject({ startsOn: day, endsOn: day });
			const [still] = await db.select().from(t.booking).where(eq(t.booking.id, id));
			expect(still!.status).toBe('confirmed');

			const avail = (await (
				await new Client().fetch(`/api/studios/hollow-pine/availability?room=live-room&from=${day}&to=${day}`)
			).json()) as {
				open: unknown[];
				closed: { date: string; reason: string }[];
			};
			expect(avail.open).toEqual([]);
			expect(avail.closed).toEqual([{ date: day, reason: 'Test blackout' }]);

			expect((await owner.form('/studio/rooms?/removeBlackout', { id: row!.id })).status).toBe(200);
			const reopened = (await (
				await new Client().fetch(`/api/studios/hollow-pine/availability?room=live-room&from=${day}&to=${day}`)
			).json()) as {
				open: unknown[];
			};
			expect(reopened.open.length).toBeGreaterThan(0);
		} finally {
			await db.delete(t.blackout).where(eq(t.blackout.reason, 'Test blackout'));
			await db.update(t.booking).set({ status: 'cancelled', cancelledAt: new Date() }).where(eq(t.booking.id, id));
		}
	});

	it('refuses a range that ends before it starts, and other roles', async () => {
		const day = OWN_DAYS[3]!;
		const bad = await owner.form('/studio/rooms?/blackout', { startsOn: day, endsOn: '2020-01-01', reason: 'Backwards' });
		expect(bad.status).toBe(422);
		expect(await bad.text()).toContain('The last day is before the first');
		const artist = await signedIn(DEMO.artist);
		await expectRefusedPage(
			await artist.form('/studio/rooms?/blackout', { startsOn: day, reason: 'Backwards' }),
			403,
			/Your role does not give access/
		);
		expect(await db.select().from(t.blackout).where(eq(t.blackout.reason, 'Backwards'))).toEqual([]);
	});
});
