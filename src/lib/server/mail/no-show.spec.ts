import { describe, expect, it } from 'vitest';
import { Temporal } from 'temporal-polyfill';
import { composeNoShow, type NoShowFacts } from './no-show';

// The instant of a wall time in the studio's zone, from the IANA database through Temporal.
const helsinki = (wall: string) => new Date(Temporal.ZonedDateTime.from(`${wall}[Europe/Helsinki]`).epochMilliseconds);

function facts(over: Partial<NoShowFacts> = {}): NoShowFacts {
	return {
		bookingId: '5d2e8b41-0c7a-4f3e-b1d9-6a4c2e9f7b30',
		reference: 'Q4TR-8WNB',
		sequence: 0,
		// Winter time in Helsinki: UTC+2.
		startsAt: helsinki('2027-01-14T18:00'),
		endsAt: helsinki('2027-01-14T21:00'),
		roomName: 'Vocal booth',
		engineerName: null,
		gear: [],
		artistName: 'Ilona Saari',
		artistEmail: 'ilona@example.test',
		project: '',
		currency: 'EUR',
		total: 9000,
		deposit: 5000,
		lines: [],
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
		bookingUrl: 'https://studio.example/bookings/5d2e8b41-0c7a-4f3e-b1d9-6a4c2e9f7b30',
		refund: 0,
		retained: 5000,
		rule: "Under 48 hours' notice: no refund of the deposit",
		bookAgainUrl: 'https://studio.example/hollow-pine/book',
		...over
	};
}

describe('the no-show note', () => {
	it('says when and where in the studio’s zone, that the deposit is kept by the terms, and how to book again', () => {
		const m = composeNoShow(facts());
		expect(m.subject).toBe('Nobody came: Vocal booth on Thursday, 14 January 2027, 18:00–21:00');
		expect(m.text).toContain('we recorded that nobody came to your session at Hollow Pine Studio.');
		expect(m.text).toContain('  When:      Thursday, 14 January 2027, 18:00–21:00 (Europe/Helsinki time)');
		expect(m.text).toContain('  Room:      Vocal booth');
		expect(m.text).toContain(
			"Your deposit of €50.00 is kept, as the studio's cancellation terms say (Under 48 hours' notice: no refund of the deposit)."
		);
		expect(m.text).toContain('To book another session: https://studio.example/hollow-pine/book');
		expect(m.text).not.toMatch(/goes back/);
	});

	it('says what goes back and what the studio keeps when the last rung gives something back', () => {
		const m = composeNoShow(
			facts({ refund: 1250, retained: 3750, rule: "Under 48 hours' notice: 25 % of the deposit refunded" })
		);
		expect(m.text).toContain('Of your deposit, €12.50 goes back to the card you paid with');
		expect(m.text).toContain('The studio keeps €37.50.');
		expect(m.text).not.toMatch(/is kept, as/);
	});
});
