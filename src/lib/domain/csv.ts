// CSV as RFC 4180 writes it: records end in CRLF; a field holding a comma, a double quote, CR or
// LF is enclosed in double quotes, and a double quote inside it is doubled.
//
// Text cells that a spreadsheet would read as a formula (starting with =, +, -, @, tab or CR) get
// a leading apostrophe (OWASP, "CSV Injection"). Only text columns are neutralised: an amount such
// as -12.50 stays a number the accountant's spreadsheet can add up.

export type CsvColumn<T> = {
	header: string;
	/** 'text' cells are neutralised; 'number' and 'date' cells are written as they are. */
	kind: 'text' | 'number' | 'date';
	value: (row: T) => string;
};

const FORMULA_START = /^[=+\-@\t\r]/;
const NEEDS_QUOTES = /[",\r\n]/;

export function neutralise(text: string): string {
	return FORMULA_START.test(text) ? `'${text}` : text;
}

export function csvField(value: string): string {
	return NEEDS_QUOTES.test(value) ? `"${value.replaceAll('"', '""')}"` : value;
}

export function toCsv<T>(columns: readonly CsvColumn<T>[], rows: readonly T[]): string {
	const header = columns.map((c) => csvField(c.header)).join(',');
	const body = rows.map((row) =>
		columns
			.map((c) => {
				const raw = c.value(row);
				return csvField(c.kind === 'text' ? neutralise(raw) : raw);
			})
			.join(',')
	);
	return [header, ...body].map((line) => `${line}\r\n`).join('');
}
