// The public calendar's data: a studio's GET /api/studios/STUDIO/availability per room, and the shapes the calendar and
// the list of free times read. No names ever: the API sends only times.
import { clockLabel, eachDay, wallClock } from '$lib/domain/time';
import { studioApiPath } from '$lib/studio-paths';

export interface AvailabilityBody {
	timeZone: string;
	room: string;
	open: { start: string; end: string }[];
	busy: { start: string; end: string }[];
	closed: { date: string; reason: string }[];
}

export interface RoomRef {
	slug: string;
	name: string;
}

export class AvailabilityError extends Error {}

/** One room's free and busy times at a studio for local dates from..to (at most 62 days, the API's limit). */
export async function fetchAvailability(
	studio: string,
	room: string,
	from: string,
	to: string,
	signal?: AbortSignal
): Promise<AvailabilityBody> {
	const q = new URLSearchParams({ room, from, to });
	const res = await fetch(`${studioApiPath(studio, 'availability')}?${q}`, { signal, headers: { accept: 'application/json' } });
	if (!res.ok) {
		const body = (await res.json().catch(() => null)) as { message?: string } | null;
		throw new AvailabilityError(body?.message ?? `The free times could not be loaded (${res.status}).`);
	}
	return (await res.json()) as AvailabilityBody;
}

export interface TimeSpan {
	room: string;
	start: string;
	end: string;
	/** Local times in the studio's zone. */
	startTime: string;
	endTime: string;
	minutes: number;
}

export interface DaySummary {
	date: string;
	free: TimeSpan[];
	busy: TimeSpan[];
	closed: { room: string; reason: string }[];
}

function span(room: string, start: string, end: string, timeZone: string, day: string): TimeSpan {
	const s = wallClock(start, timeZone);
	const e = wallClock(end, timeZone);
	return {
		room,
		start,
		end,
		// A span that runs past midnight is shown up to 24:00 on its first day.
		startTime: s.date < day ? clockLabel(0) : s.time,
		endTime: e.date > day ? clockLabel(1440) : e.time,
		minutes: Math.round((Date.parse(end) - Date.parse(start)) / 60_000)
	};
}

/** Free and busy spans per local date, for the rooms given, in time order. */
export function summariseDays(
	from: string,
	to: string,
	rooms: readonly string[],
	data: Record<string, AvailabilityBody | undefined>,
	timeZone: string
): DaySummary[] {
	const days = new Map<string, DaySummary>(eachDay(from, to).map((d) => [d, { date: d, free: [], busy: [], closed: [] }]));
	for (const room of rooms) {
		const body = data[room];
		if (!body) continue;
		for (const kind of ['open', 'busy'] as const) {
			for (const i of body[kind]) {
				const day = wallClock(i.start, timeZone).date;
				const summary = days.get(day);
				if (summary) (kind === 'open' ? summary.free : summary.busy).push(span(room, i.start, i.end, timeZone, day));
			}
		}
		for (const c of body.closed) days.get(c.date)?.closed.push({ room, reason: c.reason });
	}
	// Same start: rooms in the studio's own order.
	const order = (slug: string) => rooms.indexOf(slug);
	for (const d of days.values()) {
		d.free.sort((a, b) => a.start.localeCompare(b.start) || order(a.room) - order(b.room));
		d.busy.sort((a, b) => a.start.localeCompare(b.start) || order(a.room) - order(b.room));
	}
	return [...days.values()];
}

/** Our palette (tailwind.config.ts), for the calendar's inline colours. */
export const PALETTE = {
	ink: '#1f2a30',
	inkSoft: '#45545c',
	paper: '#f5f3ee',
	paperSunk: '#ebe7df',
	line: '#d8d2c6',
	pine: '#2e5e4e',
	pineLight: '#dcebe4',
	brass: '#a8741a',
	brassLight: '#f6ead2',
	busy: '#8a96a0',
	warn: '#9a3b22',
	warnLight: '#f8e4dc'
} as const;

/**
 * Colours per room for "All rooms", in room order: every booking is busy grey (never the free
 * green), told apart by the room's stripe and its name in the title.
 */
export const ROOM_COLOURS = [
	{ main: PALETTE.pine, container: PALETTE.busy, onContainer: PALETTE.ink },
	{ main: PALETTE.brass, container: PALETTE.busy, onContainer: PALETTE.ink },
	{ main: PALETTE.paper, container: PALETTE.busy, onContainer: PALETTE.ink },
	{ main: PALETTE.ink, container: PALETTE.busy, onContainer: PALETTE.ink }
] as const;
