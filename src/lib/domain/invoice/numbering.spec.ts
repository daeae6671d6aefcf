// Document numbers: Directive 2006/112/EC, Article 226(2) — a sequential number, in one or more
// series, that identifies the invoice uniquely. Series names (INV, DEP, CN) are Slateroom's own.
import { describe, expect, it } from 'vitest';
import {
	DOCUMENT_TYPE,
	SERIES_FOR_TYPE,
	documentKindLabel,
	documentYear,
	formatDocumentNumber,
	isDocumentTypeCode,
	missingNumbers,
	parseDocumentNumber
} from './numbering';

describe('document numbers', () => {
	it('formats a series, the year and a running number of at least four digits', () => {
		expect(formatDocumentNumber('INV', 2027, 1)).toBe('INV-2027-0001');
		expect(formatDocumentNumber('DEP', 2027, 42)).toBe('DEP-2027-0042');
		expect(formatDocumentNumber('CN', 2028, 12345)).toBe('CN-2028-12345');
	});

	it('refuses numbers that could not be unique or sequential', () => {
		expect(() => formatDocumentNumber('INV', 2027, 0)).toThrow(RangeError);
		expect(() => formatDocumentNumber('INV', 2027, 1.5)).toThrow(RangeError);
		expect(() => formatDocumentNumber('inv', 2027, 1)).toThrow(RangeError);
		expect(() => formatDocumentNumber('INV', 27, 1)).toThrow(RangeError);
	});

	it('parses back what it formats, and nothing else', () => {
		for (const [s, y, n] of [
			['INV', 2027, 1],
			['CN', 2030, 9999],
			['DEP', 2027, 10000]
		] as const) {
			expect(parseDocumentNumber(formatDocumentNumber(s, y, n))).toEqual({ series: s, year: y, number: n });
		}
		expect(parseDocumentNumber('INV-2027-1')).toBeNull();
		expect(parseDocumentNumber('INV-2027-0000')).toBeNull();
		expect(parseDocumentNumber('INV-2027-010000')).toBeNull();
		expect(parseDocumentNumber('INV 2027 0001')).toBeNull();
	});

	it('keeps one series per kind of document (UNTDID 1001: 380, 381, 386)', () => {
		expect(SERIES_FOR_TYPE[DOCUMENT_TYPE.invoice]).toBe('INV');
		expect(SERIES_FOR_TYPE[DOCUMENT_TYPE.creditNote]).toBe('CN');
		expect(SERIES_FOR_TYPE[DOCUMENT_TYPE.prepayment]).toBe('DEP');
		expect(new Set(Object.values(SERIES_FOR_TYPE)).size).toBe(3);
		expect(documentKindLabel(386)).toBe('Deposit invoice');
		expect(documentKindLabel(381)).toBe('Credit note');
		expect(documentKindLabel(380)).toBe('Invoice');
	});

	it('takes the year from the issue date in the studio’s zone, not UTC (IANA tz)', () => {
		// 2027-12-31 22:30 UTC is already 2028-01-01 00:30 in Helsinki (UTC+2 in winter).
		const newYearsEve = new Date('2027-12-31T22:30:00Z');
		expect(documentYear(newYearsEve, 'Europe/Helsinki')).toBe(2028);
		expect(documentYear(newYearsEve, 'UTC')).toBe(2027);
		expect(documentYear(newYearsEve, 'America/New_York')).toBe(2027);
	});

	it('finds gaps in a series', () => {
		expect(missingNumbers([1, 2, 3])).toEqual([]);
		expect(missingNumbers([3, 1])).toEqual([2]);
		expect(missingNumbers([])).toEqual([]);
	});
});

describe('the edges of a document number', () => {
	it('takes a series of 2 to 5 capital letters and nothing around them', () => {
		expect(formatDocumentNumber('ABCDE', 2027, 7)).toBe('ABCDE-2027-0007');
		for (const series of ['A', 'ABCDEF', 'INV1', '1INV', 'IN V']) {
			expect(() => formatDocumentNumber(series, 2027, 1), series).toThrow('series must be 2–5 capital letters');
		}
	});

	it('takes a year of four digits, 1000 to 9999', () => {
		expect(formatDocumentNumber('INV', 1000, 1)).toBe('INV-1000-0001');
		expect(formatDocumentNumber('INV', 9999, 1)).toBe('INV-9999-0001');
		expect(() => formatDocumentNumber('INV', 999, 1)).toThrow('year must have four digits');
		expect(() => formatDocumentNumber('INV', 10_000, 1)).toThrow('year must have four digits');
		expect(() => formatDocumentNumber('INV', 2027, -3)).toThrow('number must be a positive integer');
	});

	it('parses only a whole number, with nothing before or after it', () => {
		expect(parseDocumentNumber('xINV-2027-0001')).toBeNull();
		expect(parseDocumentNumber('INV-2027-0001x')).toBeNull();
		expect(parseDocumentNumber('INV-2027-0001 ')).toBeNull();
	});

	it('knows the three UNTDID 1001 codes it issues, and no other (384, a corrected invoice, is not one)', () => {
		expect([380, 381, 386].map(isDocumentTypeCode)).toEqual([true, true, true]);
		expect([0, 379, 382, 383, 384, 385, 387].map(isDocumentTypeCode)).toEqual(Array(7).fill(false));
	});
});
