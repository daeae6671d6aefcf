import { describe, expect, it } from 'vitest';
import { Gate, PoolBusyError } from './gate';

const tick = () => new Promise((r) => setTimeout(r, 0));

describe('Gate', () => {
	it('lets `size` operations run at once and the next one in only when one ends', async () => {
		const gate = new Gate(2, 10_000);
		const a = await gate.acquire();
		await gate.acquire();
		let third = false;
		const waiting = gate.acquire().then((release) => {
			third = true;
			return release;
		});
		await tick();
		expect(third).toBe(false);
		expect(gate.load).toEqual({ running: 2, waiting: 1 });
		a();
		a(); // a second release of the same turn changes nothing
		(await waiting)();
		expect(third).toBe(true);
		expect(gate.load).toEqual({ running: 1, waiting: 0 });
	});

	it('serves waiters in the order they came', async () => {
		const gate = new Gate(1, 10_000);
		const first = await gate.acquire();
		const order: number[] = [];
		const all = [1, 2, 3].map((n) => gate.run(() => Promise.resolve(void order.push(n))));
		first();
		await Promise.all(all);
		expect(order).toEqual([1, 2, 3]);
		expect(gate.load).toEqual({ running: 0, waiting: 0 });
	});

	it('gives up on a wait that is too long with PoolBusyError, and the turn is not lost', async () => {
		const gate = new Gate(1, 10_000);
		const held = await gate.acquire();
		const late = gate.acquire(20);
		await expect(late).rejects.toBeInstanceOf(PoolBusyError);
		await expect(late).rejects.toMatchObject({ code: 'POOL_BUSY' });
		expect(gate.load).toEqual({ running: 1, waiting: 0 });
		held();
		expect(gate.load).toEqual({ running: 0, waiting: 0 });
		await expect(gate.run(() => Promise.resolve('ran'))).resolves.toBe('ran');
	});

	it('ends a turn when its work fails', async () => {
		const gate = new Gate(1, 10_000);
		await expect(gate.run(() => Promise.reject(new Error('boom')))).rejects.toThrow('boom');
		expect(gate.load).toEqual({ running: 0, waiting: 0 });
	});

	it('refuses a size or a wait that makes no sense', () => {
		expect(() => new Gate(0, 1000)).toThrow();
		expect(() => new Gate(1.5, 1000)).toThrow();
		expect(() => new Gate(1, 0)).toThrow();
	});
});
