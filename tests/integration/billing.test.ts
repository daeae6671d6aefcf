// An artist's billing details over real HTTP: GET and PUT /api/me/billing, and the details chosen
// when booking (the JSON API's `billing`, the /book form's "Bill to"), kept on the booking.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { Client } from '../support/http';
import { testDb } from '../support/db';
import { workdaysAhead } from '../support/dates';
import { holdFirstFree } from '../support/booking';
import { expectRefused } from '../support/refusal';
import * as t from '../../src/lib/server/db/schema';

const { db, client } = testDb();
afterAll(() => client.end());

// This file's own working weekdays (free slots are tried in order; a taken one moves on).
const DAYS = workdaysAhead(42, 6);
const SLOTS = [
	['10:00', '12:00'],
	['14:00', '16:00'],
	['18:00', '20:00']
] as const;

// FI12345671: Finland's check digit rule worked out by hand (src/lib/domain/billing.spec.ts shows
// the sum); FI12345672 is the same with its check digit off by one.
const LABEL = {
	kind: 'organisation',
	name: 'Orchard Tapes Oy',
	street: 'Satamakatu 4',
	postalCode: '33200',
	city: 'Tampere',
	country: 'FI',
	vatId: 'fi 1234567-1'
};
const KEPT = { ...LABEL, vatId: 'FI12345671' };

let artist: Client;
let artistId: string;
beforeAll(async () => {
	const email = `billing-${crypto.randomUUID()}@slateroom.test`;
	artist = await new Client().signUp('Billing Band', email, 'billing-band-password');
	const [row] = await db.select({ id: t.user.id }).from(t.user).where(eq(t.user.email, email));
	artistId = row!.id;
});

const put = (who: Client, body: unknown) => who.json('/api/me/billing', body, 'PUT');

async function heldCount() {
	return (await db.select({ id: t.booking.id }).from(t.booking).where(eq(t.booking.artistId, artistId))).length;
}

describe('GET and PUT /api/me/billing', () => {
	it('refuse someone signed out', async () => {
		await expectRefused(await new Client().fetch('/api/me/billing'), 401);
		await expectRefused(await put(new Client(), KEPT), 401);
	});

	it('answer null before anything is saved, then the details as kept, and again on reading', async () => {
		const fresh = await new Client().signUp(
			'No Details Yet',
			`billing-none-${crypto.randomUUID()}@slateroom.test`,
			'nothing-saved-yet'
		);
		const none = await fresh.fetch('/api/me/billing');
		expect(none.status).toBe(200);
		expect(await none.json()).toBeNull();

		const saved = await put(artist, { ...LABEL, ignored: 'not a field' });
		expect(saved.status).toBe(200);
		expect(await saved.json()).toEqual(KEPT);
		const read = await artist.fetch('/api/me/billing');
		expect(await read.json()).toEqual(KEPT);
		const [row] = await db.select().from(t.billingDetails).where(eq(t.billingDetails.userId, artistId));
		expect(row).toMatchObject(KEPT);

		// Someone else's details are not theirs to read: each reads their own.
		expect(await (await fresh.fetch('/api/me/billing')).json()).toBeNull();
	});

	it('refuse a wrong VAT ID as an error on vatId alone, keeping what was saved', async () => {
		const res = await put(artist, { ...LABEL, name: 'Renamed Oy', vatId: 'FI12345672' });
		expect(res.status).toBe(422);
		const body = (await res.json()) as { error: string; message: string; fields: Record<string, string[]> };
		expect(body.error).toBe('invalid');
		expect(body.message).toMatch(/\w/);
		expect(Object.keys(body.fields)).toEqual(['vatId']);
		expect(body.fields.vatId![0]).toMatch(/check digit/);
		expect(await (await artist.fetch('/api/me/billing')).json()).toEqual(KEPT);
	});

	it('give every field its own message, and refuse a body that is not JSON', async () => {
		const res = await put(artist, {
			kind: 'person',
			name: '',
			street: 'x\u0000',
			city: '',
			postalCode: '?',
			country: 'Finland',
			vatId: 'FI12345671'
		});
		expect(res.status).toBe(422);
		const { fields } = (await res.json()) as { fields: Record<string, string[]> };
		expect(Object.keys(fields).sort()).toEqual(['city', 'country', 'name', 'postalCode', 'street', 'vatId']);
		const notJson = await artist.fetch('/api/me/billing', {
			method: 'PUT',
			headers: { 'content-type': 'application/json' },
			body: '{'
		});
		expect(notJson.status).toBe(422);
		expect(((await notJson.json()) as { error: string }).error).toBe('invalid_json');
		expect(await (await artist.fetch('/api/me/billing')).json()).toEqual(KEPT);
	});

	it('let a person be billed without a VAT ID', async () => {
		const person = {
			kind: 'person',
			name: 'Aino Virtanen',
			street: 'Kuninkaankatu 12',
			postalCode: '33210',
			city: 'Tampere',
			country: 'FI'
		};
		const other = await new Client().signUp(
			'A Person',
			`billing-person-${crypto.randomUUID()}@slateroom.test`,
			'a-person-password'
		);
		const res = await put(other, person);
		expect(res.status).toBe(200);
		expect(await res.json()).toEqual({ ...person, vatId: '' });
	});
});

describe('billing chosen at booking', () => {
	it('keeps the details sent with POST /api/studios/STUDIO/bookings on the booking', async () => {
		const held = await holdFirstFree(artist, { room: 'vocal-booth', days: DAYS, slots: SLOTS, extra: { billing: LABEL } });
		const [row] = await db.select({ billing: t.booking.billing }).from(t.booking).where(eq(t.booking.id, held.id));
		expect(row!.billing).toEqual(KEPT);
		const read = (await (await artist.fetch(`/api/bookings/${held.id}`)).json()) as { billing: unknown };
		expect(read.billing).toEqual(KEPT);
	});

	it('keeps no details without them: the artist’s name alone', async () => {
		const held = await holdFirstFree(artist, { room: 'vocal-booth', days: DAYS, slots: SLOTS, extra: { billing: null } });
		const [row] = await db.select({ billing: t.booking.billing }).from(t.booking).where(eq(t.booking.id, held.id));
		expect(row!.billing).toBeNull();
	});

	it('refuses a bad VAT ID with errors under billing.* and holds nothing', async () => {
		const before = await heldCount();
		const res = await artist.json('/api/studios/hollow-pine/bookings', {
			room: 'vocal-booth',
			start: `${DAYS[0]}T10:00`,
			end: `${DAYS[0]}T12:00`,
			billing: { ...LABEL, vatId: 'SE123456789701', postalCode: '' }
		});
		expect(res.status).toBe(422);
		const body = (await res.json()) as { error: string; fields: Record<string, string[]> };
		expect(body.error).toBe('invalid');
		expect(Object.keys(body.fields).sort()).toEqual(['billing.postalCode', 'billing.vatId']);
		expect(body.fields['billing.vatId']![0]).toMatch(/Sweden/);
		expect(await heldCount()).toBe(before);
	});

	it('books through the /book form with other details, saving them to the account when asked', async () => {
		const email = `billing-form-${crypto.randomUUID()}@slateroom.test`;
		const typist = await new Client().signUp('Form Band', email, 'form-band-password');
		const form = (day: string, start: string, extra: Record<string, string>) =>
			typist.form('/hollow-pine/book', { room: 'vocal-booth', date: day, start, kind: 'hourly', hours: '2', ...extra });
		const other = {
			billTo: 'other',
			billKind: 'organisation',
			billName: 'Form Band Ab',
			billStreet: 'Storgatan 1',
			billPostalCode: '791 71',
			billCity: 'Falun',
			billCountry: 'SE',
			billVatId: 'SE 123456789701',
			saveBilling: 'on'
		};
		const expected = {
			kind: 'organisation',
			name: 'Form Band Ab',
			street: 'Storgatan 1',
			postalCode: '791 71',
			city: 'Falun',
			country: 'SE',
			vatId: 'SE123456789701'
		};

		// A wrong VAT ID: the form comes back with the message, and nothing is held or saved.
		const refused = await form(DAYS[1]!, '10:00', { ...other, billVatId: 'SE123456789702' });
		expect(refused.status).toBe(422);
		expect(await refused.text()).toMatch(/not the form of a VAT ID from Sweden/);
		expect(await (await typist.fetch('/api/me/billing')).json()).toBeNull();

		let booked: Response | undefined;
		for (const day of DAYS.slice(1)) {
			for (const [start] of SLOTS) {
				booked = await form(day, start, other);
				if (booked.status !== 409) break;
			}
			if (booked?.status !== 409) break;
		}
		expect(booked!.status).toBe(303);
		const [row] = await db
			.select({ billing: t.booking.billing })
			.from(t.booking)
			.innerJoin(t.user, eq(t.user.id, t.booking.artistId))
			.where(eq(t.user.email, email));
		expect(row!.billing).toEqual(expected);
		expect(await (await typist.fetch('/api/me/billing')).json()).toEqual(expected);
	});
});
