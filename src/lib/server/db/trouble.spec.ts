import { describe, expect, it } from 'vitest';
import { databaseTrouble, SlowConnectError } from './trouble';
import { PoolBusyError } from './gate';

/** An error as drizzle wraps a driver's error: the code sits on the cause. */
const wrapped = (code: string) =>
	Object.assign(new Error('Failed query: select 1'), { cause: Object.assign(new Error(code), { code }) });

describe('databaseTrouble', () => {
	it('calls a server that cannot be reached or is going away down', () => {
		for (const code of ['ECONNREFUSED', 'CONNECT_TIMEOUT', 'CONNECTION_CLOSED', '57P01', '57P03', '08006']) {
			expect(databaseTrouble(wrapped(code)), code).toBe('down');
		}
		expect(databaseTrouble(Object.assign(new Error('x'), { errno: 'ECONNRESET' }))).toBe('down');
	});

	it('calls a full pool, a statement timeout, a lock timeout and the connection limit busy', () => {
		expect(databaseTrouble(new PoolBusyError(10_000))).toBe('busy');
		for (const code of ['57014', '55P03', '53300', '40001', '40P01']) expect(databaseTrouble(wrapped(code)), code).toBe('busy');
	});

	it('calls a slow connection busy although its cause is a connect timeout', () => {
		expect(databaseTrouble(new SlowConnectError(Object.assign(new Error('t'), { code: 'CONNECT_TIMEOUT' })))).toBe('busy');
	});

	it('leaves every other failure alone', () => {
		expect(databaseTrouble(wrapped('23505'))).toBeNull();
		expect(databaseTrouble(wrapped('23P01'))).toBeNull();
		expect(databaseTrouble(new TypeError('x is undefined'))).toBeNull();
		expect(databaseTrouble(null)).toBeNull();
		expect(databaseTrouble('ECONNREFUSED')).toBeNull();
	});
});
