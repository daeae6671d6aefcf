/**
 * The typed error of the availability module (the time engine's own are in ../time/errors.ts).
 */

export type AvailabilityInputErrorCode =
	'invalid-range' | 'invalid-policy' | 'invalid-busy' | 'invalid-blackout' | 'invalid-now' | 'invalid-duration' | 'invalid-count';

/** The caller gave computeAvailability/startsThatFit something malformed (a bug, not a user error). */
export class AvailabilityInputError extends Error {
	readonly code: AvailabilityInputErrorCode;

	constructor(code: AvailabilityInputErrorCode, message: string) {
		super(message);
		this.name = 'AvailabilityInputError';
		this.code = code;
	}
}
