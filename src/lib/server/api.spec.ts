import { describe, expect, it } from 'vitest';
import { dataExceptionCode } from './api';

describe('dataExceptionCode', () => {
	it('finds a PostgreSQL data exception (class 22) through the causes it is wrapped in', () => {
		expect(dataExceptionCode({ code: '22021' })).toBe('22021');
		expect(dataExceptionCode(Object.assign(new Error('query failed'), { cause: { code: '22008' } }))).toBe('22008');
		expect(dataExceptionCode({ cause: { cause: { code: '22P02' } } })).toBe('22P02');
	});

	it('leaves every other failure alone', () => {
		expect(dataExceptionCode({ code: '23505' })).toBeNull();
		expect(dataExceptionCode({ code: '08006' })).toBeNull();
		expect(dataExceptionCode({ code: 'ECONNREFUSED' })).toBeNull();
		expect(dataExceptionCode(new Error('boom'))).toBeNull();
		expect(dataExceptionCode(null)).toBeNull();
	});
});
