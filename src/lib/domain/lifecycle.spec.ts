import { describe, expect, it } from 'vitest';
import { closeRefusal } from './lifecycle';

const start = new Date('2027-03-02T08:00:00Z');

describe('closing a session', () => {
	it('is refused before the session starts, saying when it opens', () => {
		const twoWeeksAhead = new Date(start.getTime() - 14 * 86_400_000);
		const refusal = closeRefusal({ status: 'confirmed', startsAt: start }, twoWeeksAhead);
		expect(refusal).toMatchObject({ code: 'not_started', opensAt: start });
		expect(closeRefusal({ status: 'confirmed', startsAt: start }, new Date(start.getTime() - 1))?.code).toBe('not_started');
	});

	it('is allowed from the first minute of the session on', () => {
		expect(closeRefusal({ status: 'confirmed', startsAt: start }, start)).toBeNull();
		expect(closeRefusal({ status: 'confirmed', startsAt: start }, new Date(start.getTime() + 3 * 86_400_000))).toBeNull();
	});

	it('needs a confirmed booking, whatever the time', () => {
		const later = new Date(start.getTime() + 3_600_000);
		for (const status of ['held', 'pending', 'cancelled', 'expired', 'completed']) {
			expect(closeRefusal({ status, startsAt: start }, later)?.code).toBe('not_confirmed');
		}
	});
});
