/**
 * Half-open intervals [start, end): the end instant is not part of the interval, so a booking
 * 10:00–11:00 and one 11:00–12:00 are back to back, not overlapping (the usual convention for
 * time ranges, e.g. PostgreSQL's default '[)' tstzrange bounds used for the exclusion constraint).
 */

export interface Interval {
	start: Date;
	end: Date;
}

/** Milliseconds since the epoch, the form all arithmetic here uses. */
export interface Span {
	start: number;
	end: number;
}

/** Half-open overlap: true when the two intervals share at least one instant. Empty intervals overlap nothing. */
export function overlaps(a: Interval, b: Interval): boolean {
	const as = a.start.getTime();
	const ae = a.end.getTime();
	const bs = b.start.getTime();
	const be = b.end.getTime();
	return as < ae && bs < be && as < be && bs < ae;
}

export function toSpan(i: Interval): Span {
	return { start: i.start.getTime(), end: i.end.getTime() };
}

export function toInterval(s: Span): Interval {
	return { start: new Date(s.start), end: new Date(s.end) };
}

/** Sorts and unions spans; touching spans (a.end === b.start) are joined; empty spans are dropped. */
export function mergeSpans(spans: readonly Span[]): Span[] {
	const sorted = spans.filter((s) => s.end > s.start).sort((a, b) => a.start - b.start || a.end - b.end);
	const out: Span[] = [];
	for (const s of sorted) {
		const last = out[out.length - 1];
		if (last && s.start <= last.end) {
			if (s.end > last.end) last.end = s.end;
		} else {
			out.push({ start: s.start, end: s.end });
		}
	}
	return out;
}

/** base minus cuts; both may be unsorted. */
export function subtractSpans(base: readonly Span[], cuts: readonly Span[]): Span[] {
	const mergedCuts = mergeSpans(cuts);
	const out: Span[] = [];
	for (const b of mergeSpans(base)) {
		let cursor = b.start;
		for (const c of mergedCuts) {
			if (c.end <= cursor) continue;
			if (c.start >= b.end) break;
			if (c.start > cursor) out.push({ start: cursor, end: c.start });
			cursor = Math.max(cursor, c.end);
			if (cursor >= b.end) break;
		}
		if (cursor < b.end) out.push({ start: cursor, end: b.end });
	}
	return out;
}

/** Intersects each span with [lo, hi) and drops what becomes empty. */
export function clipSpans(spans: readonly Span[], lo: number, hi: number): Span[] {
	const out: Span[] = [];
	for (const s of spans) {
		const start = Math.max(s.start, lo);
		const end = Math.min(s.end, hi);
		if (end > start) out.push({ start, end });
	}
	return out;
}
