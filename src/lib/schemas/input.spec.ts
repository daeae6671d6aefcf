import { describe, expect, it } from 'vitest';
import { dateProblem, dateText, hasControlChars, isStudioDate, lineText, multilineText } from './input';

describe('text fields', () => {
	it('refuse NUL and the other control characters, and DEL', () => {
		for (const bad of ['\u0000', 'a\u0000b', '\u0007', '\u001b[31m', 'x\u007f']) {
			expect(hasControlChars(bad)).toBe(true);
			expect(lineText().safeParse(bad).success).toBe(false);
			expect(multilineText().safeParse(bad).success).toBe(false);
		}
	});

	it('take tabs and line breaks only where text runs over several lines', () => {
		for (const text of ['two\nlines', 'a\r\nb', 'tab\there']) {
			expect(lineText().safeParse(text).success).toBe(false);
			expect(multilineText().safeParse(text).success).toBe(true);
		}
		expect(lineText().safeParse('Live room – Ä ✓').success).toBe(true);
	});
});

describe('dates', () => {
	it('are real days of the calendar within 2000–2100', () => {
		expect(isStudioDate('2027-03-28')).toBe(true);
		expect(isStudioDate('2028-02-29')).toBe(true);
		expect(isStudioDate('2000-01-01')).toBe(true);
		expect(isStudioDate('2100-12-31')).toBe(true);
		for (const bad of [
			'2027-02-29',
			'2027-02-30',
			'2027-13-01',
			'0001-01-01',
			'9999-12-31',
			'1999-12-31',
			'2101-01-01',
			'2027-3-1',
			'hello',
			''
		]) {
			expect(isStudioDate(bad)).toBe(false);
			expect(dateText().safeParse(bad).success).toBe(false);
		}
	});

	it('say what is wrong', () => {
		expect(dateProblem('2027-03-28')).toBeNull();
		expect(dateProblem('2027-02-30')).toBe('There is no 2027-02-30 on the calendar.');
		expect(dateProblem('0001-01-01')).toBe('Choose a date between 2000 and 2100.');
		expect(dateProblem('hello')).toBe('Use a date such as 2027-03-28.');
	});
});
