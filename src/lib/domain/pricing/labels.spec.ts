import { describe, expect, it } from 'vitest';
import { formatDuration } from '../time';
import { decimalHours, formatPercent } from './labels';

describe('words and quantities of price lines', () => {
	it('gives a duration in hours and minutes, leaving out a part that is zero', () => {
		expect(formatDuration(120)).toBe('2 h');
		expect(formatDuration(150)).toBe('2 h 30 min');
		expect(formatDuration(45)).toBe('45 min');
		expect(formatDuration(0)).toBe('0 min');
		expect(formatDuration(24 * 60 + 1)).toBe('24 h 1 min');
	});

	it('gives minutes as decimal hours, to four places at most and without trailing zeros', () => {
		// By hand: 90 / 60 = 1.5; 15 / 60 = 0.25; 3 / 60 = 0.05; 20 / 60 = 0.33333… → 0.3333;
		// 1 / 60 = 0.016666… → 0.0167 (rounded half up); 600 / 60 = 10.
		expect(decimalHours(90)).toBe('1.5');
		expect(decimalHours(15)).toBe('0.25');
		expect(decimalHours(3)).toBe('0.05');
		expect(decimalHours(20)).toBe('0.3333');
		expect(decimalHours(1)).toBe('0.0167');
		expect(decimalHours(600)).toBe('10');
		expect(decimalHours(606)).toBe('10.1');
	});

	it('writes a percent with a space before the sign (SI Brochure, 9th edition, 5.4.7)', () => {
		expect(formatPercent(2500)).toBe('25 %');
		expect(formatPercent(2550)).toBe('25.5 %');
	});
});
