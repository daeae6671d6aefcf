import { describe, expect, it } from 'vitest';
import ical from 'node-ical';
import { Temporal } from 'temporal-polyfill';
import { bookingCalendarFile, composeCancellation, composeConfirmation, type ConfirmationFacts } from './confirmation';

// The instant of a wall time in the studio's zone, from the IANA database through Temporal (an
// outside reference, independent of the app's own zone code).
const helsinki = (wall: string) => new Date(Temporal.ZonedDateTime.from(`${wall}[Europe/Helsinki]`).epochMilliseconds);

function facts(over: Partial<ConfirmationFacts> = {}): ConfirmationFacts {
	return {
		bookingId: '7f1c2a9e-52b4-4c1d-9e0a-3b6f4d2c8a11',
		reference: '7K3Q-XM2P',
		sequence: 0,
		// 2027-03-28 is the EU spring change (Directive 2000/84/EC): Helsinki is UTC+3 from 04:00.
		startsAt: helsinki('2027-03-28T10:00'),
		endsAt: helsinki('2027-03-28T14:00'),
		roomName: 'Live room',
		engineerName: 'Elias Harmaa',
		gear: ['Ribbon microphone, figure-of-eight'],
		artistName: 'Noa Virta',
		artistEmail: 'artist@slateroom.test',
		project: 'Second EP, drums',
		currency: 'EUR',
		total: 34500,
		deposit: 10400,
		lines: [
			{ label: 'Live room, half day', amount: 16000 },
			{ label: 'Engineer, half day', amount: 12000 }
		],
		studio: {
			name: 'Hollow Pine Studio',
			email: 'hello@hollowpine.test',
			timeZone: 'Europe/Helsinki',
			locale: 'en-GB',
			street: 'Kuusikkotie 14',
			postalCode: '33980',
			city: 'Pirkkala',
			country: 'FI'
		},
		bookingUrl: 'http://127.0.0.1:3000/bookings/7f1c2a9e-52b4-4c1d-9e0a-3b6f4d2c8a11',
		...over
	};
}

describe('the confirmation calendar file (RFC 5545)', () => {
	it('holds one VEVENT with the booking as UID, a UTC DTSTAMP and the exact instants, parsed back by node-ical', () => {
		const now = new Date('2027-03-01T09:30:00Z');
		const file = bookingCalendarFile(facts(), now);
		const parsed = ical.sync.parseICS(file);
		const events = Object.values(parsed).filter((c) => c?.type === 'VEVENT');
		expect(events).toHaveLength(1);
		const ev = events[0] as ical.VEvent;
		expect(ev.uid).toBe('7f1c2a9e-52b4-4c1d-9e0a-3b6f4d2c8a11');
		// 10:00 in Helsinki on the day clocks go forward is 07:00 UTC (UTC+3 after 04:00).
		expect(new Date(ev.start).toISOString()).toBe('2027-03-28T07:00:00.000Z');
		expect(new Date(ev.end!).toISOString()).toBe('2027-03-28T11:00:00.000Z');
		// RFC 5545 §3.8.7.2: DTSTAMP in UTC, ending in Z; one of it per VEVENT.
		expect(file.match(/^DTSTAMP:(\d{8}T\d{6}Z)\r$/gm)).toEqual(['DTSTAMP:20270301T093000Z\r']);
		expect(file).toMatch(/^DTSTART:20270328T070000Z\r$/m);
		expect(file).toMatch(/^SEQUENCE:0\r$/m);
		expect(ev.location).toBe('Kuusikkotie 14, 33980 Pirkkala, Finland');
	});

	it('uses CRLF line ends and folds lines at 75 octets (RFC 5545 §3.1)', () => {
		const file = bookingCalendarFile(
			facts({ gear: ['Large-diaphragm condenser, cardioid, with shock mount and pop filter'.repeat(3)] })
		);
		expect(file.replaceAll('\r\n', '')).not.toMatch(/[\r\n]/);
		for (const line of file.split('\r\n')) expect(Buffer.byteLength(line, 'utf8')).toBeLessThanOrEqual(75);
		expect(file.split('\r\n').some((l) => l.startsWith(' '))).toBe(true);
	});

	it('writes the same file whatever the host’s time zone (known ical-generator trap with local times)', () => {
		const now = new Date('2027-03-01T09:30:00Z');
		const before = process.env.TZ;
		try {
			process.env.TZ = 'UTC';
			const utc = bookingCalendarFile(facts(), now);
			process.env.TZ = 'America/New_York';
			const ny = bookingCalendarFile(facts(), now);
			expect(ny).toBe(utc);
		} finally {
			process.env.TZ = before;
		}
	});
});

describe('the confirmation message', () => {
	it('says when in the studio’s zone, the price, the balance and what to prepare', () => {
		const m = composeConfirmation(facts());
		expect(m.subject).toBe('Booked: Live room on Sunday, 28 March 2027, 10:00–14:00');
		expect(m.text).toContain('Sunday, 28 March 2027, 10:00–14:00 (Europe/Helsinki time)');
		expect(m.text).toContain('Live room, half day: €160.00');
		expect(m.text).toContain('Total: €345.00');
		expect(m.text).toContain('Deposit received: €104.00');
		// 345.00 − 104.00 = 241.00
		expect(m.text).toContain('Balance after the session: €241.00');
		expect(m.text).toContain('A capo pushes strings sharp');
		expect(m.text).toContain('2003/10/EC');
		expect(m.text).toContain('Send the engineer a running order');
		expect(m.text).toContain(facts().bookingUrl);
	});

	it('says when no engineer is booked and leaves out empty gear', () => {
		const m = composeConfirmation(facts({ engineerName: null, gear: [], project: '' }));
		expect(m.text).toContain('Engineer:  none booked');
		expect(m.text).not.toContain('Gear:');
		expect(m.text).not.toContain('Project:');
		expect(m.text).toContain('Engineer:  none booked\n  Reference: 7K3Q-XM2P');
		expect(m.text).toContain('Write a running order');
	});
});

describe('the cancellation message', () => {
	it('says what comes back by the policy and carries a calendar file that cancels the event (RFC 5546 CANCEL)', () => {
		const m = composeCancellation(
			{ ...facts({ sequence: 2 }), refund: 5200, retained: 5200, rule: '48 hours to 7 days’ notice: half the deposit back' },
			new Date('2027-03-20T08:00:00Z')
		);
		expect(m.subject).toBe('Cancelled: Live room on Sunday, 28 March 2027, 10:00–14:00');
		expect(m.text).toContain('Cancellation terms: 48 hours to 7 days’ notice: half the deposit back.');
		expect(m.text).toContain('Refund: €52.00');
		expect(m.text).toContain('Kept by the studio: €52.00.');
		expect(m.ics).toMatch(/^METHOD:CANCEL\r$/m);
		const ev = Object.values(ical.sync.parseICS(m.ics)).find((c) => c?.type === 'VEVENT') as ical.VEvent;
		expect(ev.uid).toBe(facts().bookingId);
		expect(ev.status).toBe('CANCELLED');
		// RFC 5545 §3.8.7.4: a change to the event raises SEQUENCE above the last one sent.
		expect(m.ics).toMatch(/^SEQUENCE:3\r$/m);
	});

	it('says plainly when nothing comes back', () => {
		const m = composeCancellation({
			...facts(),
			refund: 0,
			retained: 10400,
			rule: 'Under 48 hours’ notice: no refund of the deposit'
		});
		expect(m.text).toContain('Refund: none.');
		expect(m.text).toContain('Kept by the studio: €104.00.');
	});
});
