// The confirmation e-mail over real sockets: the app, the Stripe fake's signed webhook, the
// outbox in the real database and the mail catcher's HTTP API. RFC 5545 for the calendar file,
// parsed back independently with node-ical.
import { afterAll, describe, expect, it } from 'vitest';
import { eq, like } from 'drizzle-orm';
import ical from 'node-ical';
import Stripe from 'stripe';
import { signedIn, type Client } from '../support/http';
import { APP_URL, DEMO, MAIL_API, STRIPE_API_BASE } from '../support/env';
import { studioIdOf, testDb } from '../support/db';
import { waitFor } from '../support/wait';
import { workdaysAhead } from '../support/dates';
import { accountOf, payOnFake } from '../support/stripe-fake';
import { holdFirstFree } from '../support/booking';
import * as t from '../../src/lib/server/db/schema';

const { db, client } = testDb();
afterAll(() => client.end());

const fakeUrl = new URL(STRIPE_API_BASE);
const stripe = new Stripe('sk_test_mail_spec', { host: fakeUrl.hostname, port: Number(fakeUrl.port), protocol: 'http' });

interface CaughtMail {
	id: string;
	subject: string;
	text: string;
	to: { address: string }[];
	from: { address: string; name: string }[];
	attachments?: { filename: string; generatedFileName: string; contentType: string }[];
}

async function mailTo(address: string): Promise<CaughtMail[]> {
	const all = (await (await fetch(`${MAIL_API}/api/email`)).json()) as CaughtMail[];
	return all.filter((m) => m.to.some((t) => t.address === address));
}

/** This file's days: working weekdays from 140 days ahead (clear of other specs), tried in order. */
const DAYS = workdaysAhead(140, 20);

/** A two-hour evening in the control room with an engineer, on the first free one of this file's days. */
const bookWithEngineer = (who: Client) =>
	holdFirstFree(who, {
		room: 'control-room',
		days: DAYS,
		slots: [['19:00', '21:00']],
		extra: { engineer: true, project: 'Night vocals' }
	});

/** The confirmations about one booking in the catcher (its receipts are other messages). */
const confirmations = async (bookingId: string) =>
	(await mailTo(DEMO.artist)).filter((m) => m.text.includes(`/bookings/${bookingId}`) && m.subject.startsWith('Booked:'));

describe('the confirmation e-mail', () => {
	it('is sent once, after the deposit is paid, with the times, price, checklist and a calendar file', async () => {
		const artist = await signedIn(DEMO.artist);
		const b = await bookWithEngineer(artist);
		const [row] = await db.select().from(t.booking).where(eq(t.booking.id, b.id));

		// Nothing is queued for a hold: the slot is not the artist's until the deposit arrives.
		const queued = () =>
			db
				.select()
				.from(t.emailOutbox)
				.where(like(t.emailOutbox.dedupeKey, `%${b.id}%`));
		expect(await queued()).toEqual([]);

		expect(await payOnFake(b.sessionId)).toBe(200);

		const mail = await waitFor(async () => (await confirmations(b.id)).at(0), 'the confirmation in the mail catcher');
		// One confirmation, and none went out for the hold (the deposit's receipt is a message of
		// its own, keyed by its payment: recorded-payments.test.ts).
		expect(await confirmations(b.id)).toHaveLength(1);
		expect((await queued()).map((r) => r.dedupeKey)).toEqual([`booking-confirmed:${b.id}`]);
		expect(mail.subject).toMatch(/^Booked: Control room on \w+, \d{1,2} \w+ \d{4}, 19:00–21:00$/);
		expect(mail.from[0]!.name).toBe('Hollow Pine Studio');
		expect(mail.text).toContain('Engineer:  ');
		expect(mail.text).not.toContain('none booked');
		expect(mail.text).toContain('Project:   Night vocals');
		expect(mail.text).toContain(`${APP_URL}/bookings/${b.id}`);
		expect(mail.text).toContain('tune again with the capo on');
		const euros = (minor: number) => `€${(minor / 100).toFixed(2)}`; // display only; amounts are integers
		expect(mail.text).toContain(`Total: ${euros(b.quote.total)}`);
		expect(mail.text).toContain(`Deposit received: ${euros(b.quote.deposit)}`);
		expect(mail.text).toContain(`Balance after the session: ${euros(b.quote.total - b.quote.deposit)}`);

		const file = mail.attachments?.find((a) => a.filename.endsWith('.ics'));
		expect(file?.contentType).toMatch(/^text\/calendar/);
		const ics = await (await fetch(`${MAIL_API}/api/email/${mail.id}/attachment/${file!.generatedFileName}`)).text();
		const vevents = Object.values(ical.sync.parseICS(ics)).filter((c): c is ical.VEvent => c?.type === 'VEVENT');
		expect(vevents).toHaveLength(1);
		expect(vevents[0]!.uid).toBe(b.id);
		expect(new Date(vevents[0]!.start).getTime()).toBe(row!.startsAt.getTime());
		expect(new Date(vevents[0]!.end!).getTime()).toBe(row!.endsAt.getTime());
		expect(ics).toMatch(/^DTSTAMP:\d{8}T\d{6}Z\r$/m);

		const [outbox] = await db
			.select()
			.from(t.emailOutbox)
			.where(eq(t.emailOutbox.dedupeKey, `booking-confirmed:${b.id}`));
		expect(outbox?.status).toBe('sent');

		// The same payment told again (Stripe delivers at least once) makes no second message. The
		// event is the demo studio's connected account's (its deposits are made on it).
		const events = await stripe.events.list(
			{ type: 'checkout.session.completed', limit: 100 },
			{ stripeAccount: await accountOf(db, await studioIdOf(db)) }
		);
		const completed = events.data.find((e) => (e.data.object as { id?: string }).id === b.sessionId);
		expect(completed).toBeDefined();
		const resend = await fetch(`${STRIPE_API_BASE}/_control/events/${completed!.id}/resend`, {
			method: 'POST',
			headers: { 'content-type': 'application/json' },
			body: '{}'
		});
		expect(resend.status).toBe(202);
		// Wait until the app has taken the resent event (the fake logs its answer), then look.
		const answered = await waitFor(async () => {
			const res = await fetch(`${STRIPE_API_BASE}/_control/deliveries?event=${completed!.id}`);
			const { data } = (await res.json()) as { data: { kind: string; statusCode: number | null }[] };
			const resent = data.filter((d) => d.kind === 'resend' && d.statusCode !== null);
			return resent.length > 0 ? resent : undefined;
		}, 'the resent event answered');
		expect(answered.map((d) => d.statusCode)).toEqual([200]);
		expect(await confirmations(b.id)).toHaveLength(1);
		const rows = await db
			.select()
			.from(t.emailOutbox)
			.where(eq(t.emailOutbox.dedupeKey, `booking-confirmed:${b.id}`));
		expect(rows).toHaveLength(1);
	});
});
