/**
 * Document types and numbers.
 *
 * Directive 2006/112/EC, Article 226(2): an invoice carries "a sequential number, based on one or
 * more series, which uniquely identifies the invoice". Slateroom keeps one series per kind of
 * document and calendar year (series names are our own choice):
 *
 *   INV-2027-0001  invoice (UNTDID 1001 code 380)
 *   DEP-2027-0001  prepayment invoice for a deposit received on account (code 386; Article 65)
 *   CN-2027-0001   credit note (code 381; Article 219: a document that amends an invoice and
 *                  refers to it unambiguously is itself an invoice)
 *
 * Numbers inside a series and year run 1, 2, 3 … without gaps; the database hands them out
 * under a row lock (src/lib/server/invoices/issue.ts). The year is the calendar year of the
 * issue date in the studio's time zone.
 */
import { localDateOf } from '../time';

/** UNTDID 1001 document name codes used by Slateroom (EN 16931 BT-3). */
export const DOCUMENT_TYPE = {
	invoice: 380,
	creditNote: 381,
	prepayment: 386
} as const;
export type DocumentTypeCode = (typeof DOCUMENT_TYPE)[keyof typeof DOCUMENT_TYPE];

export const SERIES_FOR_TYPE: Record<DocumentTypeCode, string> = {
	380: 'INV',
	381: 'CN',
	386: 'DEP'
};

export function isDocumentTypeCode(code: number): code is DocumentTypeCode {
	return code === 380 || code === 381 || code === 386;
}

/** Words for people: "Invoice", "Credit note", "Deposit invoice". */
export function documentKindLabel(code: number): string {
	if (code === DOCUMENT_TYPE.creditNote) return 'Credit note';
	if (code === DOCUMENT_TYPE.prepayment) return 'Deposit invoice';
	return 'Invoice';
}

/** The minimum width of the running number: INV-2027-0001; wider numbers keep every digit. */
export const NUMBER_WIDTH = 4;

/** "INV", 2027, 1 → "INV-2027-0001". */
export function formatDocumentNumber(series: string, year: number, number: number): string {
	if (!/^[A-Z]{2,5}$/.test(series)) throw new RangeError(`series must be 2–5 capital letters, got ${series}`);
	if (!Number.isInteger(year) || year < 1000 || year > 9999) throw new RangeError(`year must have four digits, got ${year}`);
	if (!Number.isSafeInteger(number) || number < 1) throw new RangeError(`number must be a positive integer, got ${number}`);
	return `${series}-${year}-${String(number).padStart(NUMBER_WIDTH, '0')}`;
}

/** The inverse of formatDocumentNumber; null for anything else. */
export function parseDocumentNumber(text: string): { series: string; year: number; number: number } | null {
	const match = /^([A-Z]{2,5})-(\d{4})-(\d{4,})$/.exec(text);
	if (!match) return null;
	const number = Number(match[3]);
	if (number < 1 || (match[3]!.length > NUMBER_WIDTH && match[3]!.startsWith('0'))) return null;
	return { series: match[1]!, year: Number(match[2]), number };
}

/** Calendar year of an instant in a time zone (IANA tz database): the year a number belongs to. */
export function documentYear(issuedAt: Date, timeZone: string): number {
	return Number(localDateOf(issuedAt, timeZone).slice(0, 4));
}

/** Numbers missing from 1..max (a gap in a series); empty when the series is whole. */
export function missingNumbers(numbers: readonly number[]): number[] {
	const seen = new Set(numbers);
	const max = numbers.reduce((a, b) => Math.max(a, b), 0);
	const missing: number[] = [];
	for (let n = 1; n <= max; n++) if (!seen.has(n)) missing.push(n);
	return missing;
}
