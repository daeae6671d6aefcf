import { describe, expect, it } from 'vitest';
import { overlaps } from './index';
import { clipSpans, mergeSpans, subtractSpans } from './intervals';
import { at } from '$fixtures/availability';

const iv = (a: string, b: string) => ({
	start: at(`2027-01-15T${a}:00+02:00`),
	end: at(`2027-01-15T${b}:00+02:00`)
});

describe('overlaps (half-open [start, end))', () => {
	it('does not count back-to-back bookings as overlapping', () => {
		// Half-open intervals, as PostgreSQL's default '[)' range bounds: 10:00–11:00 then 11:00–12:00.
		expect(overlaps(iv('10:00', '11:00'), iv('11:00', '12:00'))).toBe(false);
		expect(overlaps(iv('11:00', '12:00'), iv('10:00', '11:00'))).toBe(false);
	});

	it('counts any shared instant', () => {
		// Allen's interval algebra: overlaps, during, equals all share time.
		expect(overlaps(iv('10:00', '11:01'), iv('11:00', '12:00'))).toBe(true);
		expect(overlaps(iv('10:00', '14:00'), iv('11:00', '12:00'))).toBe(true);
		expect(overlaps(iv('10:00', '11:00'), iv('10:00', '11:00'))).toBe(true);
	});

	it('never counts an empty interval (an empty set shares no instant)', () => {
		expect(overlaps(iv('11:00', '11:00'), iv('10:00', '12:00'))).toBe(false);
	});
});

describe('span helpers', () => {
	it('merges touching and overlapping spans, subtracts and clips', () => {
		// Plain set algebra on the real line.
		expect(
			mergeSpans([
				{ start: 5, end: 7 },
				{ start: 0, end: 2 },
				{ start: 2, end: 3 },
				{ start: 6, end: 9 }
			])
		).toEqual([
			{ start: 0, end: 3 },
			{ start: 5, end: 9 }
		]);
		expect(
			subtractSpans(
				[{ start: 0, end: 10 }],
				[
					{ start: 2, end: 3 },
					{ start: 8, end: 12 },
					{ start: -5, end: 1 }
				]
			)
		).toEqual([
			{ start: 1, end: 2 },
			{ start: 3, end: 8 }
		]);
		expect(
			clipSpans(
				[
					{ start: 0, end: 10 },
					{ start: 12, end: 14 }
				],
				5,
				12
			)
		).toEqual([{ start: 5, end: 10 }]);
	});
});

describe('span helpers — empty pieces (an empty set is no span)', () => {
	it('never counts an empty interval on either side', () => {
		expect(overlaps(iv('10:00', '12:00'), iv('11:00', '11:00'))).toBe(false);
		expect(overlaps(iv('10:00', '12:00'), iv('11:00', '11:30'))).toBe(true);
	});

	it('drops empty spans when merging, and leaves no empty piece when a cut meets an edge', () => {
		expect(mergeSpans([{ start: 5, end: 5 }])).toEqual([]);
		expect(
			mergeSpans([
				{ start: 4, end: 4 },
				{ start: 0, end: 2 }
			])
		).toEqual([{ start: 0, end: 2 }]);
		// Set difference: [0, 10) minus [0, 5) is [5, 10); minus [5, 10) is [0, 5); minus both, nothing.
		expect(subtractSpans([{ start: 0, end: 10 }], [{ start: 0, end: 5 }])).toEqual([{ start: 5, end: 10 }]);
		expect(subtractSpans([{ start: 0, end: 10 }], [{ start: 5, end: 10 }])).toEqual([{ start: 0, end: 5 }]);
		expect(
			subtractSpans(
				[{ start: 0, end: 10 }],
				[
					{ start: 5, end: 10 },
					{ start: 0, end: 5 }
				]
			)
		).toEqual([]);
	});
});
