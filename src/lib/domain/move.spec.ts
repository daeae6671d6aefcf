import { describe, expect, it } from 'vitest';
import { DEMO_POLICY } from './demo';
import { quoteBooking } from './pricing';
import { bookedGear, bookedPolicy, bookedRates, movePolicyWords, moveTerms, settleMove } from './move';

const H = 3_600_000;
const now = new Date('2027-03-01T09:00:00Z');
const at = (hours: number) => new Date(now.getTime() + hours * H);
const policy = { freeHours: 168, minHours: 48, fee: 2500 };

describe('moveTerms: the moving policy', () => {
	const artist = (hours: number, status = 'confirmed') =>
		moveTerms({ mover: 'artist', own: true, status, startsAt: at(hours), now, policy });

	it('is free for the artist with at least the free hours of notice (the boundary included)', () => {
		expect(artist(168)).toMatchObject({ allowed: true, fee: 0 });
		expect(artist(400)).toMatchObject({ allowed: true, fee: 0 });
	});

	it('costs the fee between the minimum and the free hours', () => {
		expect(artist(167.99)).toMatchObject({ allowed: true, fee: 2500 });
		expect(artist(48)).toMatchObject({ allowed: true, fee: 2500 });
	});

	it('refuses the artist under the minimum notice', () => {
		expect(artist(47.99)).toMatchObject({ allowed: false, refusal: 'too_late' });
		expect(artist(1)).toMatchObject({ allowed: false, refusal: 'too_late' });
	});

	it('lets the owner move any booking, free, however close', () => {
		expect(moveTerms({ mover: 'owner', own: false, status: 'confirmed', startsAt: at(1), now, policy })).toMatchObject({
			allowed: true,
			fee: 0
		});
	});

	it('refuses an artist moving someone else’s booking', () => {
		expect(moveTerms({ mover: 'artist', own: false, status: 'confirmed', startsAt: at(400), now, policy })).toMatchObject({
			allowed: false,
			refusal: 'not_yours'
		});
	});

	it('moves only confirmed sessions that have not started, for the owner too', () => {
		for (const status of ['held', 'pending', 'completed', 'cancelled', 'expired', 'no_show']) {
			expect(artist(400, status)).toMatchObject({ allowed: false, refusal: 'not_movable' });
			expect(moveTerms({ mover: 'owner', own: false, status, startsAt: at(400), now, policy }).allowed).toBe(false);
		}
		expect(moveTerms({ mover: 'owner', own: false, status: 'confirmed', startsAt: at(0), now, policy })).toMatchObject({
			allowed: false,
			refusal: 'started'
		});
	});

	it('says the rule in words', () => {
		const money = (m: number) => `€${(m / 100).toFixed(2)}`;
		expect(movePolicyWords(policy, money)).toBe(
			"Free with 7 days' notice or more; €25.00 with 48 hours' notice or more; not possible under 48 hours."
		);
		expect(movePolicyWords({ freeHours: 48, minHours: 48, fee: 0 }, money)).toBe(
			"Free with 48 hours' notice or more; not possible with less notice."
		);
	});
});

describe('settleMove: the settlement of the deposit (worked examples of move.ts)', () => {
	const base = {
		depositPolicy: DEMO_POLICY,
		mover: 'artist' as const,
		now,
		cancellation: DEMO_POLICY.cancellation
	};

	it('1. same price, free move: nothing changes hands', () => {
		expect(settleMove({ ...base, newTotal: 32000, depositPaid: 9600, fee: 0, startsAt: at(240) })).toEqual({
			newDeposit: 9600,
			settlement: 0,
			toPay: 0,
			refund: 0,
			kept: 0,
			rule: null
		});
	});

	it('2. dearer, with the fee: the deposit difference plus the fee is paid', () => {
		const s = settleMove({ ...base, newTotal: 40000, depositPaid: 9600, fee: 2500, startsAt: at(100) });
		expect(s).toMatchObject({ newDeposit: 12000, settlement: 4900, toPay: 4900, refund: 0 });
	});

	it('3. cheaper with 10 days’ notice: the whole excess deposit goes back', () => {
		const s = settleMove({ ...base, newTotal: 20000, depositPaid: 12000, fee: 0, startsAt: at(240) });
		expect(s).toMatchObject({ newDeposit: 6000, settlement: -6000, toPay: 0, refund: 6000, kept: 0 });
	});

	it('4. cheaper with 3 days’ notice: half the excess goes back, half stays paid toward the booking', () => {
		const s = settleMove({ ...base, newTotal: 20000, depositPaid: 12000, fee: 2500, startsAt: at(72) });
		// newDeposit 60.00 − 120.00 + 25.00 = −35.00; the ladder at 72 h gives back half: 17.50.
		expect(s).toMatchObject({ newDeposit: 6000, settlement: -3500, refund: 1750, kept: 1750 });
		expect(s.rule).toContain('half');
	});

	it('refunds the whole difference when the studio moves the session', () => {
		const s = settleMove({ ...base, mover: 'owner', newTotal: 20000, depositPaid: 12000, fee: 0, startsAt: at(2) });
		expect(s).toMatchObject({ settlement: -6000, refund: 6000, kept: 0 });
	});

	it('keeps the deposit minimum: a small new total still asks at least 50.00', () => {
		const s = settleMove({ ...base, newTotal: 6000, depositPaid: 5000, fee: 0, startsAt: at(240) });
		expect(s).toMatchObject({ newDeposit: 5000, settlement: 0 });
	});
});

describe('the new price at the rate card the booking was made under', () => {
	const room = { slug: 'live-room', name: 'Live room', rates: { hourly: 4500, halfDay: 16_000, fullDay: 30_000 } };
	// Tuesday 2 March 2027, 10:00–14:00 Helsinki (08:00–12:00 UTC): a half day, no surcharge.
	const stored = quoteBooking({
		start: new Date('2027-03-02T08:00:00Z'),
		end: new Date('2027-03-02T12:00:00Z'),
		room,
		engineer: true,
		gear: [{ id: 'g1', label: 'Tube mic', fee: 2000 }],
		policy: DEMO_POLICY,
		holidays: () => false
	});

	it('keeps the unit prices the booking bought and takes today’s for the rest', () => {
		const today = { hourly: 5000, halfDay: 20_000, fullDay: 36_000 };
		expect(bookedRates(stored, 'room', today)).toEqual({ hourly: 5000, halfDay: 16_000, fullDay: 36_000 });
		expect(bookedRates(stored, 'engineer', today)).toEqual({ hourly: 5000, halfDay: 12_000, fullDay: 36_000 });
		expect(
			bookedGear(stored, [
				{ id: 'g1', label: 'Tube mic', fee: 3000 },
				{ id: 'g2', label: 'Tape machine', fee: 5000 }
			]).map((g) => g.fee)
		).toEqual([2000, 5000]);
	});

	it('re-quotes a later half day at the booked prices, with the surcharges of the new time', () => {
		const today = { ...room, rates: { hourly: 5000, halfDay: 20_000, fullDay: 36_000 } };
		const requote = quoteBooking({
			// Tuesday 16:00–20:00 Helsinki: the evening surcharge applies to its last two hours.
			start: new Date('2027-03-02T14:00:00Z'),
			end: new Date('2027-03-02T18:00:00Z'),
			room: { ...today, rates: bookedRates(stored, 'room', today.rates) },
			engineer: true,
			gear: bookedGear(stored, [{ id: 'g1', label: 'Tube mic', fee: 3000 }]),
			policy: { ...bookedPolicy(stored, DEMO_POLICY), engineerRates: bookedRates(stored, 'engineer', DEMO_POLICY.engineerRates) },
			holidays: () => false
		});
		expect(requote.lines.find((l) => l.key === 'room:half-day')?.amount).toBe(16_000);
		expect(requote.lines.some((l) => l.kind === 'surcharge')).toBe(true);
		expect(requote.total).toBeGreaterThan(stored.total);
	});

	it('keeps the VAT rate the booking was quoted at', () => {
		expect(bookedPolicy(stored, { ...DEMO_POLICY, vatRateBp: 2400 }).vatRateBp).toBe(DEMO_POLICY.vatRateBp);
	});
});
