/**
 * The booking grid: instants whose local wall time is a whole multiple of the increment counted
 * from local midnight (09:00, 09:30, ... for 30 min). In Europe/Helsinki the offset is whole hours
 * so the UTC and local grids coincide, but in Asia/Kolkata (+05:30) or Asia/Kathmandu (+05:45)
 * they do not (IANA tz database), and around a DST change the offset moves under our feet; hence
 * the checks below.
 */
import { findTransition, localParts, offsetMsAt } from './zoned';

const MINUTE_MS = 60_000;
const DAY_MS = 86_400_000;

/** Milliseconds since the last grid line on the local wall clock (0 when on the grid). */
function msPastGrid(ms: number, timeZone: string, incrementMs: number): { past: number; toMidnight: number } {
	const p = localParts(ms, timeZone);
	const msOfDay = p.minuteOfDay * MINUTE_MS + p.subMinuteMs;
	return { past: msOfDay % incrementMs, toMidnight: DAY_MS - msOfDay };
}

/** True when the instant's local wall time is a whole multiple of the increment from local midnight. */
export function isOnLocalGrid(ms: number, timeZone: string, incrementMinutes: number): boolean {
	return msPastGrid(ms, timeZone, incrementMinutes * MINUTE_MS).past === 0;
}

/** The first instant at or after `ms` that lies on the local grid. */
export function ceilToLocalGrid(ms: number, timeZone: string, incrementMinutes: number): number {
	const inc = incrementMinutes * MINUTE_MS;
	let t = ms;
	for (let guard = 0; guard < 16; guard++) {
		const { past, toMidnight } = msPastGrid(t, timeZone, inc);
		if (past === 0) return t;
		// The grid restarts at each local midnight, so when the increment does not divide a day
		// the next line may be midnight rather than the next multiple.
		const candidate = t + Math.min(inc - past, toMidnight);
		if (offsetMsAt(timeZone, candidate) === offsetMsAt(timeZone, t)) return candidate;
		// The offset changed before the candidate: on the old offset no grid line comes before the
		// change, so carry on from the instant of the change on the new offset.
		t = findTransition(timeZone, t, candidate);
	}
	throw new Error('ceilToLocalGrid did not converge');
}

/** The last instant at or before `ms` that lies on the local grid. */
export function floorToLocalGrid(ms: number, timeZone: string, incrementMinutes: number): number {
	const inc = incrementMinutes * MINUTE_MS;
	let t = ms;
	for (let guard = 0; guard < 16; guard++) {
		const { past } = msPastGrid(t, timeZone, inc);
		if (past === 0) return t;
		const candidate = t - past;
		if (offsetMsAt(timeZone, candidate) === offsetMsAt(timeZone, t)) return candidate;
		// The offset changed after the candidate: no grid line between the change and t on the
		// current offset, so carry on from just before the change on the old offset.
		t = findTransition(timeZone, candidate, t) - 1;
	}
	throw new Error('floorToLocalGrid did not converge');
}
