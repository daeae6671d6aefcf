import { describe, expect, it } from 'vitest';
import { parse } from 'csv-parse/sync';
import { toCsv, type CsvColumn } from './csv';

interface Row {
	name: string;
	amount: string;
}
const columns: CsvColumn<Row>[] = [
	{ header: 'Customer', kind: 'text', value: (r) => r.name },
	{ header: 'Amount', kind: 'number', value: (r) => r.amount }
];

describe('CSV (RFC 4180)', () => {
	it('ends every record in CRLF and quotes commas, quotes and line breaks, read back by csv-parse', () => {
		const name = 'Band "The Commas", Ltd\nsecond line';
		const out = toCsv(columns, [{ name, amount: '-12.50' }]);
		// RFC 4180 §2.1 and §2.6–2.7: CRLF, fields with specials in quotes, inner quotes doubled.
		expect(out).toBe('Customer,Amount\r\n"Band ""The Commas"", Ltd\nsecond line",-12.50\r\n');
		const back = parse<Record<string, string>>(out, { columns: true });
		expect(back).toEqual([{ Customer: name, Amount: '-12.50' }]);
	});

	it('neutralises formula-like text but leaves negative amounts as numbers (OWASP CSV injection)', () => {
		const rows = ['=SUM(A1:A9)', '+1', '-2', '@cmd', '\tx', '\rx', 'plain'].map((name) => ({ name, amount: '-3.00' }));
		const back = parse<Record<string, string>>(toCsv(columns, rows), { columns: true });
		expect(back.map((r) => r.Customer)).toEqual(["'=SUM(A1:A9)", "'+1", "'-2", "'@cmd", "'\tx", "'\rx", 'plain']);
		expect(back.every((r) => r.Amount === '-3.00')).toBe(true);
	});

	it('writes only the header for no rows', () => {
		expect(toCsv(columns, [])).toBe('Customer,Amount\r\n');
	});
});
