import { describe, expect, it } from 'vitest';
import { hasSlugShape, RESERVED_SLUGS, slugFromName, slugProblem, SLUG_MAX } from './studio-slug';

describe('a studio short name', () => {
	it('takes lower-case words joined by single hyphens', () => {
		for (const ok of ['hollow-pine', 'abc', 'room9', 'a1-b2-c3', 'x'.repeat(SLUG_MAX)]) {
			expect(slugProblem(ok), ok).toBeNull();
			expect(hasSlugShape(ok), ok).toBe(true);
		}
	});

	it('refuses what a DNS label would refuse, with a reason for each', () => {
		expect(slugProblem('ab')).toMatch(/at least 3/);
		expect(slugProblem('x'.repeat(SLUG_MAX + 1))).toMatch(/at most 40/);
		expect(slugProblem('Hollow-Pine')).toMatch(/lower-case/);
		expect(slugProblem('9lives')).toMatch(/Begin with a letter/);
		expect(slugProblem('-abc')).toMatch(/Begin with a letter/);
		expect(slugProblem('hollow--pine')).toMatch(/single hyphens/);
		expect(slugProblem('hollow-')).toMatch(/End with a letter/);
		expect(slugProblem('hollow_pine')).toMatch(/only lower-case/);
		expect(slugProblem('hollów')).toMatch(/only lower-case/);
		for (const bad of ['ab', 'Hollow', '9x', 'a--b', 'ab-', 'a b', 'a.b', 'ab/c', '%41bc'])
			expect(hasSlugShape(bad), bad).toBe(false);
	});

	it('keeps the platform’s own words, though they have the shape', () => {
		for (const word of ['api', 'studio', 'sign-in', 'bookings', 'plan', 'accounts', 'invitations', 'studios']) {
			expect(RESERVED_SLUGS.has(word)).toBe(true);
			expect(hasSlugShape(word)).toBe(true);
			expect(slugProblem(word)).toMatch(/kept for Slateroom/);
		}
	});

	it('proposes a short name from a studio name', () => {
		expect(slugFromName('Hollow Pine')).toBe('hollow-pine');
		expect(slugFromName('  Studio Ålvsjö & Co. ')).toBe('studio-alvsjo-co');
		expect(slugFromName('7 Hills Tape')).toBe('hills-tape');
		expect(slugProblem(slugFromName('Röd Lada Inspelning'))).toBeNull();
		expect(slugFromName('x'.repeat(60)).length).toBe(SLUG_MAX);
	});
});
