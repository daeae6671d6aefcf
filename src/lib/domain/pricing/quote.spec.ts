/**
 * Quotes for the invented demo studio (src/lib/domain/demo.ts): Hollow Pine Studio, Europe/Helsinki,
 * EUR, prices include VAT at 25.5 %. Amounts in cents. Every quote is also checked against
 * EN 16931 BR-CO-10/13/14/15/16/17 (expectEn16931).
 * Calendar: 2027-03-02 is a Tuesday, 2027-03-06 a Saturday, 2027-12-06 (Finnish Independence
 * Day) a Monday, 2027-12-26 (Boxing Day) a Sunday.
 */
import { describe, expect, it } from 'vitest';
import { DEMO_POLICY } from '../demo';
import { quoteBooking, type QuoteInput } from './quote';
import {
	at,
	CONTROL_ROOM,
	expectEn16931,
	LIVE_ROOM,
	line,
	noHolidays,
	openAllHours,
	policyWith,
	VOCAL_BOOTH
} from '$fixtures/pricing';

const quote = (overrides: Partial<QuoteInput> & Pick<QuoteInput, 'start' | 'end'>) => {
	const q = quoteBooking({ room: LIVE_ROOM, engineer: false, gear: [], policy: DEMO_POLICY, ...overrides });
	expectEn16931(q);
	return q;
};

describe('room time (demo rates, worked by hand)', () => {
	it('live room Tuesday 10:00–15:00 (5 h) = half day + 1 h = 205.00', () => {
		const q = quote({ start: at('2027-03-02', '10:00'), end: at('2027-03-02', '15:00') });
		expect(q.durationMinutes).toBe(300);
		expect(q.lines.map((l) => [l.key, l.amount])).toEqual([
			['room:half-day', 16000],
			['room:hourly', 4500]
		]);
		expect(q.total).toBe(20500);
		// EN 16931 with prices incl. 25.5 % VAT: line nets 160.00 / 1.255 = 127.49 (127.490…),
		// 45.00 / 1.255 = 35.86 (35.856…); Σ 163.35 (BR-CO-10); VAT 163.35 × 25.5 % = 41.654… → 41.65
		// (BR-CO-17); gross 163.35 + 41.65 = 205.00 (BR-CO-15) = the advertised 205.00, rounding 0.
		expect(line(q, 'room:half-day').net).toBe(12749);
		expect(line(q, 'room:hourly').net).toBe(3586);
		expect(q.net).toBe(16335);
		expect(q.vat).toEqual([{ ratePercent: '25.5', rateBp: 2550, base: 16335, amount: 4165 }]);
		expect(q.gross).toBe(20500);
		expect(q.rounding).toBe(0);
		// Deposit: 30 % of 205.00 = 61.50, rounded up to whole euros = 62.00 (deposit.ts).
		expect(q.deposit).toBe(6200);
		expect(q.balance).toBe(14300);
		expect(q.roomBlocks).toMatchObject({ fullDays: 0, halfDays: 1, hourlyMinutes: 60, increments: 2 });
		expect(q.engineerBlocks).toBeNull();
	});

	it('7 h 30 = full day 300.00; 4 h = 160.00; 3 h = 135.00; 10 h = 390.00', () => {
		const total = (from: string, to: string) => quote({ start: at('2027-03-02', from), end: at('2027-03-02', to) }).total;
		expect(total('09:30', '17:00')).toBe(30000); // full day, cheaper than 160.00 + 3.5 × 45.00 = 317.50
		expect(total('10:00', '14:00')).toBe(16000); // half day
		expect(total('10:00', '13:00')).toBe(13500); // 3 × 45.00
		// 10 h 08:00–18:00 would be outside opening hours for a booking, but pricing only prices:
		expect(total('08:00', '18:00')).toBe(39000); // full day 300.00 + 2 × 45.00
	});

	it('prices the other demo rooms from their own rate cards', () => {
		const start = at('2027-03-02', '10:00');
		const end = at('2027-03-02', '15:00');
		expect(quote({ start, end, room: VOCAL_BOOTH }).total).toBe(13000); // 100.00 + 30.00
		expect(quote({ start, end, room: CONTROL_ROOM }).total).toBe(18000); // 140.00 + 40.00
	});

	it('adds engineer time priced the same way from 35.00 / 120.00 / 230.00', () => {
		const q = quote({ start: at('2027-03-02', '10:00'), end: at('2027-03-02', '15:00'), engineer: true });
		expect(line(q, 'engineer:half-day').amount).toBe(12000);
		expect(line(q, 'engineer:hourly').amount).toBe(3500);
		expect(q.total).toBe(36000); // 205.00 + 155.00
		// Deposit 30 % of 360.00 = 108.00 exactly.
		expect(q.deposit).toBe(10800);
		expect(q.engineerBlocks).toMatchObject({ halfDays: 1, hourlyMinutes: 60, price: 15500 });
	});

	it('refuses an end that is not after the start', () => {
		expect(() => quote({ start: at('2027-03-02', '10:00'), end: at('2027-03-02', '10:00') })).toThrow(RangeError);
	});
});

describe('surcharges: each surcharged minute pays its % of its share of the block time bought (our rule)', () => {
	// surcharge = cover price × Σ(% of each booked minute) ÷ capacity (the minutes of block time bought).
	it('Tuesday 16:00–20:00: 120 of the 240 min bought are evening → 160.00 × 25 % × 120/240 = 20.00', () => {
		const q = quote({ start: at('2027-03-02', '16:00'), end: at('2027-03-02', '20:00') });
		const evening = line(q, 'surcharge:evening:room');
		expect(evening.amount).toBe(2000);
		expect(evening.label).toBe('Evening surcharge on Live room (25 %, 2 h)');
		expect(q.total).toBe(18000);
		expect(q.surchargeMinutes).toEqual([{ ruleId: 'evening', label: 'Evening surcharge', percentBp: 2500, minutes: 120 }]);
		// Deposit 30 % of 180.00 = 54.00.
		expect(q.deposit).toBe(5400);
	});

	it('applies the evening surcharge to engineer time too', () => {
		// Tuesday 16:00–21:00, 5 h, 3 h in the evening window. Each resource buys exactly 300 min
		// (half day + 1 h): room 205.00 + 205.00 × 25 % × 180/300 = 30.75 → 235.75 (a full day would be
		// 300.00 + 300.00 × 25 % × 180/480 = 28.13 → 328.13); engineer 155.00 + 155.00 × 25 % × 180/300
		// = 23.25 → 178.25 (full day 230.00 + 21.56 = 251.56).
		const q = quote({ start: at('2027-03-02', '16:00'), end: at('2027-03-02', '21:00'), engineer: true });
		expect(line(q, 'surcharge:evening:room').amount).toBe(3075);
		expect(line(q, 'surcharge:evening:engineer')).toMatchObject({
			amount: 2325,
			label: 'Evening surcharge on engineer time (25 %, 3 h)'
		});
		expect(q.total).toBe(41400); // 205.00 + 30.75 + 155.00 + 23.25
		// Deposit 30 % of 414.00 = 124.20 → rounded up to whole euros: 125.00.
		expect(q.deposit).toBe(12500);
		expect(q.balance).toBe(28900);
	});

	it('10 h Tuesday 09:00–19:00: full day + 2 h buys 600 min: 390.00 + 390.00 × 25 % × 60/600 = 9.75', () => {
		// Two full days: 600.00 + 600.00 × 25 % × 60/960 = 9.38 → 609.38, dearer.
		const q = quote({ start: at('2027-03-02', '09:00'), end: at('2027-03-02', '19:00') });
		expect(line(q, 'surcharge:evening:room').amount).toBe(975);
		expect(q.total).toBe(39975);
		// 30 % of 399.75 = 119.925 → 120.00.
		expect(q.deposit).toBe(12000);
	});

	it('weekend: Saturday 10:00–14:00 = 160.00 + 20 % = 192.00; Saturday evening is weekend only', () => {
		const day = quote({ start: at('2027-03-06', '10:00'), end: at('2027-03-06', '14:00') });
		expect(line(day, 'surcharge:weekend:room')).toMatchObject({
			amount: 3200,
			label: 'Weekend surcharge on Live room (20 %, 4 h)'
		});
		expect(day.total).toBe(19200);
		// 18:00–22:00 Saturday: the evening rule is Monday–Friday, so +20 % again, no +25 %.
		const night = quote({ start: at('2027-03-06', '18:00'), end: at('2027-03-06', '22:00') });
		expect(night.lines.map((l) => l.key)).toEqual(['room:half-day', 'surcharge:weekend:room']);
		expect(night.total).toBe(19200);
	});

	it('Finnish Independence Day 2027-12-06: +50 % beats the +25 % evening on every minute', () => {
		// Monday 16:00–20:00 with engineer and one piece of gear (15.00, never surcharged).
		// Holiday (date-holidays, FI) wins all 240 minutes: room 160.00 × 50 % = 80.00,
		// engineer 120.00 × 50 % = 60.00; no evening line at all.
		const q = quote({
			start: at('2027-12-06', '16:00'),
			end: at('2027-12-06', '20:00'),
			engineer: true,
			gear: [{ id: 'ribbon-1', label: 'Ribbon microphone, figure-8', fee: 1500 }]
		});
		expect(q.lines.map((l) => [l.key, l.amount])).toEqual([
			['room:half-day', 16000],
			['engineer:half-day', 12000],
			['surcharge:holiday:room', 8000],
			['surcharge:holiday:engineer', 6000],
			['gear:ribbon-1', 1500]
		]);
		expect(q.surchargeMinutes).toEqual([{ ruleId: 'holiday', label: 'Public holiday surcharge', percentBp: 5000, minutes: 240 }]);
		// Advertised gross 435.00. Line nets (÷ 1.255, half-up): 127.49, 95.62, 63.75 (63.745…),
		// 47.81, 11.95 → Σ 346.62; VAT 346.62 × 25.5 % = 88.388… → 88.39; gross 435.01.
		// The extra cent is the explicit rounding amount −0.01 (BT-114): due 435.01 − 0.01 = 435.00.
		expect(q.net).toBe(34662);
		expect(q.vatTotal).toBe(8839);
		expect(q.gross).toBe(43501);
		expect(q.rounding).toBe(-1);
		expect(q.total).toBe(43500);
		// Deposit 30 % of 435.00 = 130.50 → 131.00.
		expect(q.deposit).toBe(13100);
	});

	it('Boxing Day 2027-12-26, a Sunday: +50 % holiday beats +20 % weekend', () => {
		const q = quote({ start: at('2027-12-26', '10:00'), end: at('2027-12-26', '14:00') });
		expect(q.lines.map((l) => l.key)).toEqual(['room:half-day', 'surcharge:holiday:room']);
		expect(q.total).toBe(24000); // 160.00 + 80.00
	});

	it('without a holiday calendar the same Monday is an evening like any other', () => {
		const q = quote({ start: at('2027-12-06', '16:00'), end: at('2027-12-06', '20:00'), holidays: noHolidays });
		expect(q.total).toBe(18000); // 160.00 + 20.00
	});

	it('picks the highest rule per minute when windows overlap', () => {
		// Invented rules: A +10 % 12:00–20:00 and B +30 % 16:00–18:00 on Tuesdays. Tuesday
		// 14:00–20:00 (6 h = 160.00 + 2 × 45.00 = 250.00 buying 360 min): A wins 4 h, B wins 2 h (not
		// 10 % + 30 %). A: 250.00 × 10 % × 240/360 = 16.666…; B: 250.00 × 30 % × 120/360 = 25.00;
		// total 41.666… → 41.67, split 16.67 + 25.00.
		const policy = policyWith({
			surcharges: [
				{
					id: 'a',
					label: 'Afternoon surcharge',
					kind: 'window',
					percentBp: 1000,
					weekdays: [2],
					fromMinute: 720,
					toMinute: 1200
				},
				{ id: 'b', label: 'Peak surcharge', kind: 'window', percentBp: 3000, weekdays: [2], fromMinute: 960, toMinute: 1080 }
			]
		});
		const q = quote({ start: at('2027-03-02', '14:00'), end: at('2027-03-02', '20:00'), policy });
		expect(line(q, 'surcharge:a:room')).toMatchObject({ amount: 1667, label: 'Afternoon surcharge on Live room (10 %, 4 h)' });
		expect(line(q, 'surcharge:b:room')).toMatchObject({ amount: 2500, label: 'Peak surcharge on Live room (30 %, 2 h)' });
		expect(q.total).toBe(25000 + 1667 + 2500);
	});

	it('splits a night from a Sunday into a holiday Monday by the minute', () => {
		// Open round the clock. Sun 2027-12-05 20:00 → Mon 2027-12-06 02:00: 6 h, half day + 2 h = 250.00
		// buying 360 min. Weekend 240 min: 250.00 × 20 % × 240/360 = 33.333…; holiday 120 min:
		// 250.00 × 50 % × 120/360 = 41.666…; together exactly 75.00, split 33.33 + 41.67 (the spare cent
		// goes to the larger remainder). A full day instead: 300.00 + 300.00 × (48 + 60)/480 = 367.50.
		const q = quote({ start: at('2027-12-05', '20:00'), end: at('2027-12-06', '02:00'), policy: openAllHours() });
		expect(line(q, 'surcharge:weekend:room').amount).toBe(3333);
		expect(line(q, 'surcharge:holiday:room').amount).toBe(4167);
		expect(q.total).toBe(32500);
	});
});

describe('gear hire (a flat price per booking, demo gear)', () => {
	it('adds a line per item at its fee per booking, never surcharged', () => {
		const gear = [
			{ id: 'sdc-pair', label: 'Small-diaphragm condenser pair, cardioid', fee: 2000 },
			{ id: 'tube-pre', label: 'Valve preamp, two channels', fee: 3500 }
		];
		const q = quote({ start: at('2027-03-06', '10:00'), end: at('2027-03-06', '14:00'), gear });
		expect(line(q, 'gear:sdc-pair')).toMatchObject({
			label: 'Gear hire: Small-diaphragm condenser pair, cardioid',
			quantity: '1',
			amount: 2000
		});
		expect(line(q, 'gear:tube-pre').amount).toBe(3500);
		// Saturday: only the room carries +20 %: 160.00 + 32.00 + 20.00 + 35.00 = 247.00.
		expect(q.total).toBe(24700);
	});

	it('refuses a negative fee (EN 16931 BR-27) and keeps keys unique for a repeated item', () => {
		const start = at('2027-03-02', '10:00');
		const end = at('2027-03-02', '12:00');
		expect(() => quote({ start, end, gear: [{ id: 'x', label: 'X', fee: -1 }] })).toThrow(RangeError);
		const twice = quote({
			start,
			end,
			gear: [
				{ id: 'x', label: 'X', fee: 100 },
				{ id: 'x', label: 'X', fee: 100 }
			]
		});
		expect(twice.lines.map((l) => l.key)).toEqual(['room:hourly', 'gear:x', 'gear:x#2']);
	});
});

describe('VAT on top (source: EN 16931 BR-CO-17, BR-CO-15)', () => {
	it('adds VAT per rate on the sum of line nets when prices exclude VAT', () => {
		// 5 h live room at net prices, VAT 24 %: net 205.00, VAT 49.20, total 254.20, no rounding.
		const policy = policyWith({ pricesIncludeVat: false, vatRateBp: 2400 });
		const q = quote({ start: at('2027-03-02', '10:00'), end: at('2027-03-02', '15:00'), policy });
		expect(q.net).toBe(20500);
		expect(q.vat).toEqual([{ ratePercent: '24', rateBp: 2400, base: 20500, amount: 4920 }]);
		expect(q.total).toBe(25420);
		expect(q.rounding).toBe(0);
		// Deposit 30 % of 254.20 = 76.26 → 77.00.
		expect(q.deposit).toBe(7700);
	});
});

describe('daylight-saving nights bill real elapsed time (Directive 2000/84/EC; IANA tz)', () => {
	const plain = openAllHours({ surcharges: [] });

	it('Sat 2027-03-27 22:00 → Sun 2027-03-28 22:00 is 23 h (03:00 jumps to 04:00)', () => {
		// 23 h: 2 full days 600.00 + half day 160.00 + 3 h 135.00 = 895.00 (3 full days: 900.00).
		// Engineer 23 h: 2 × 230.00 + 120.00 + 3 × 35.00 = 685.00 (3 full: 690.00).
		const q = quote({ start: at('2027-03-27', '22:00'), end: at('2027-03-28', '22:00'), engineer: true, policy: plain });
		expect(q.durationMinutes).toBe(23 * 60);
		expect(q.roomBlocks).toMatchObject({ fullDays: 2, halfDays: 1, hourlyMinutes: 180, price: 89500 });
		expect(q.engineerBlocks?.price).toBe(68500);
		expect(q.total).toBe(158000);
	});

	it('Sat 2027-10-30 22:00 → Sun 2027-10-31 22:00 is 25 h (04:00 falls back to 03:00)', () => {
		// 25 h: 3 full days 900.00 + 1 h 45.00 = 945.00.
		const q = quote({ start: at('2027-10-30', '22:00'), end: at('2027-10-31', '22:00'), policy: plain });
		expect(q.durationMinutes).toBe(25 * 60);
		expect(q.total).toBe(94500);
	});

	it('counts surcharge minutes in real time too: Easter Sunday 2027-03-28 has 21 real hours to 22:00', () => {
		// Sat 22:00–24:00 weekend (120 min); Easter Sunday 00:00–22:00 local is 21 real hours
		// (1260 min) at +50 % holiday: Σ % over the booked minutes = 120 × 20 % + 1260 × 50 % = 654
		// (as many minutes at 100 %), so a cover pays price × 654/capacity. The 23 h need 1380 min:
		//   2 full + half + 3 h = 895.00 buying 1380 min: 895.00 + 895.00 × 654/1380 = 895.00 + 424.15 = 1319.15;
		//   3 full days         = 900.00 buying 1440 min: 900.00 + 900.00 × 654/1440 = 900.00 + 408.75 = 1308.75.
		// Surcharges included, 3 full days are cheaper: weekend 900.00 × 20 % × 120/1440 = 15.00,
		// holiday 900.00 × 50 % × 1260/1440 = 393.75.
		const q = quote({ start: at('2027-03-27', '22:00'), end: at('2027-03-28', '22:00'), policy: openAllHours() });
		expect(q.surchargeMinutes.map((s) => [s.ruleId, s.minutes])).toEqual([
			['weekend', 120],
			['holiday', 1260]
		]);
		expect(q.roomBlocks).toMatchObject({ fullDays: 3, halfDays: 0, hourlyMinutes: 0, coveredMinutes: 1440, price: 90000 });
		expect(line(q, 'surcharge:weekend:room').amount).toBe(1500);
		expect(line(q, 'surcharge:holiday:room').amount).toBe(39375);
		expect(q.total).toBe(130875);
	});

	it('and the 25-hour Sunday 2027-10-31 carries 25 h of weekend surcharge', () => {
		// 3 full days + 1 h = 945.00 buys exactly the 1500 min: 945.00 × 20 % × 1500/1500 = 189.00
		// (4 full days: 1200.00 + 1200.00 × 20 % × 1500/1920 = 1387.50).
		const q = quote({ start: at('2027-10-30', '22:00'), end: at('2027-10-31', '22:00'), policy: openAllHours() });
		expect(q.surchargeMinutes).toEqual([{ ruleId: 'weekend', label: 'Weekend surcharge', percentBp: 2000, minutes: 1500 }]);
		expect(q.total).toBe(94500 + 18900);
	});
});

describe('the cover is chosen with surcharges included (our rule)', () => {
	it('a longer booking never costs less: Tuesday 15:00–22:30 ≤ 14:30–22:30', () => {
		// Both buy one full day, 300.00 for 480 min; both have 270 evening minutes (18:00–22:30).
		// 15:00–22:30 (7 h 30): 300.00 + 300.00 × 25 % × 270/480 = 42.1875 → 42.19 → 342.19
		//   (half day + 3 h 30 = 317.50 buying 450 min: 317.50 + 317.50 × 25 % × 270/450 = 47.63 → 365.13).
		// 14:30–22:30 (8 h):    300.00 + 300.00 × 25 % × 270/480 = 42.19 → 342.19, the same.
		// (The old rule spread the block price over the booked minutes: 345.00 for the shorter booking.)
		const shorter = quote({ start: at('2027-03-02', '15:00'), end: at('2027-03-02', '22:30') });
		const longer = quote({ start: at('2027-03-02', '14:30'), end: at('2027-03-02', '22:30') });
		expect(shorter.lines.map((l) => [l.key, l.amount])).toEqual([
			['room:full-day', 30000],
			['surcharge:evening:room', 4219]
		]);
		expect(shorter.total).toBe(34219);
		expect(longer.total).toBe(34219);
		expect(shorter.total).toBeLessThanOrEqual(longer.total);
		// Deposit 30 % of 342.19 = 102.657 → 103.00.
		expect(shorter.deposit).toBe(10300);
	});

	it('Saturday 10:00–17:00 (7 h at +20 %): the room takes a full day, the engineer half day + 3 h', () => {
		// Room:     half day + 3 h = 295.00 buying 420 min: 295.00 + 295.00 × 20 % × 420/420 = 59.00 → 354.00;
		//           full day       = 300.00 buying 480 min: 300.00 + 300.00 × 20 % × 420/480 = 52.50 → 352.50. Full day.
		// Engineer: half day + 3 h = 225.00: 225.00 + 225.00 × 20 % × 420/420 = 45.00 → 270.00;
		//           full day       = 230.00: 230.00 + 230.00 × 20 % × 420/480 = 40.25 → 270.25. Half day + 3 h.
		const q = quote({ start: at('2027-03-06', '10:00'), end: at('2027-03-06', '17:00'), engineer: true });
		expect(q.roomBlocks).toMatchObject({ fullDays: 1, halfDays: 0, hourlyMinutes: 0, coveredMinutes: 480, price: 30000 });
		expect(q.engineerBlocks).toMatchObject({ fullDays: 0, halfDays: 1, hourlyMinutes: 180, coveredMinutes: 420, price: 22500 });
		expect(q.lines.map((l) => [l.key, l.amount])).toEqual([
			['room:full-day', 30000],
			['engineer:half-day', 12000],
			['engineer:hourly', 10500],
			['surcharge:weekend:room', 5250],
			['surcharge:weekend:engineer', 4500]
		]);
		expect(q.total).toBe(62250); // 352.50 + 270.00
		// Deposit 30 % of 622.50 = 186.75 → 187.00.
		expect(q.deposit).toBe(18700);
	});

	it('Tuesday 16:00–23:00 (7 h, 5 h evening): a full day, 346.88, beats half day + 3 h, 347.68', () => {
		// Half day + 3 h: 295.00 + 295.00 × 25 % × 300/420 = 52.678… → 347.68.
		// Full day:       300.00 + 300.00 × 25 % × 300/480 = 46.875 → 46.88 → 346.88.
		const q = quote({ start: at('2027-03-02', '16:00'), end: at('2027-03-02', '23:00') });
		expect(q.roomBlocks).toMatchObject({ fullDays: 1, coveredMinutes: 480 });
		expect(line(q, 'surcharge:evening:room')).toMatchObject({
			amount: 4688,
			label: 'Evening surcharge on Live room (25 %, 5 h)'
		});
		expect(q.total).toBe(34688);
	});
});

describe('the words and units of block, engineer and gear lines', () => {
	it('names full days, half days and hours with their lengths, in UN/ECE Rec. 20 units (C62 one, HUR hour)', () => {
		// Tuesday 09:00–22:00 without surcharges: 13 h = a full day (8 h) + a half day (4 h) + 1 h,
		// 300.00 + 160.00 + 45.00 = 505.00, cheaper than a full day and 5 h (525.00) or two full days.
		const q = quote({ start: at('2027-03-02', '09:00'), end: at('2027-03-02', '22:00'), policy: policyWith({ surcharges: [] }) });
		expect(q.total).toBe(50500);
		expect(q.lines.map((l) => [l.label, l.unitCode])).toEqual([
			['Live room, full day (8 h)', 'C62'],
			['Live room, half day (4 h)', 'C62'],
			['Live room, hourly (1 h)', 'HUR']
		]);
	});

	it('names the surcharge on the engineer’s time, and gives gear one unit', () => {
		const q = quote({
			start: at('2027-03-02', '18:00'),
			end: at('2027-03-02', '20:00'),
			engineer: true,
			gear: [{ id: 'tube-pre', label: 'Valve preamp', fee: 3500 }]
		});
		expect(q.lines.map((l) => l.label)).toContain('Evening surcharge on engineer time (25 %, 2 h)');
		expect(line(q, 'gear:tube-pre').unitCode).toBe('C62');
	});

	it('takes whole minutes only, and an end after the start', () => {
		const start = at('2027-03-02', '10:00');
		expect(() =>
			quoteBooking({
				start,
				end: new Date(start.getTime() + 2 * 3_600_000 + 30_000),
				room: LIVE_ROOM,
				engineer: false,
				gear: [],
				policy: DEMO_POLICY
			})
		).toThrow('times must fall on whole minutes');
		expect(() => quoteBooking({ start, end: start, room: LIVE_ROOM, engineer: false, gear: [], policy: DEMO_POLICY })).toThrow(
			'end must be after start'
		);
	});
});
