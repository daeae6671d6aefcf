// Finding a free slot the way every spec does: a file has its own days (tests/support/dates.ts)
// and a few slots on each, tried in order; a slot someone else holds (409) moves on to the next.
// No imports, so that both the integration specs and the Playwright specs can use it.

/** A wall-clock slot on each day: [from, to] as 'HH:mm' in the studio's zone. */
export type SlotTimes = readonly (readonly [string, string])[];

/** A slot tried: its day and its local start and end as the API takes them ('YYYY-MM-DDTHH:mm'). */
export interface Slot {
	day: string;
	start: string;
	end: string;
}

/**
 * Tries `days` × `slots` in order with `tryHold` until one answers 201, and gives that answer's
 * body with its slot. A 409 (taken) tries the next; any other answer (also 409 `bookings_not_open`)
 * fails at once with its body.
 */
export async function firstFree<T>(
	days: readonly string[],
	slots: SlotTimes,
	tryHold: (slot: Slot) => Promise<{ status: number; body: () => Promise<unknown> }>
): Promise<T & Slot> {
	for (const day of days) {
		for (const [from, to] of slots) {
			const slot = { day, start: `${day}T${from}`, end: `${day}T${to}` };
			const res = await tryHold(slot);
			const body = await res.body();
			// A studio that takes no bookings yet answers 409 too: no slot of it will ever be free.
			if (res.status === 409 && (body as { error?: string } | null)?.error !== 'bookings_not_open') continue;
			if (res.status !== 201) throw new Error(`holding ${slot.start}–${to} answered ${res.status}: ${JSON.stringify(body)}`);
			return { ...(body as T), ...slot };
		}
	}
	throw new Error(`no free slot (${slots.map(([f, t]) => `${f}–${t}`).join(', ')}) from ${days[0]} to ${days.at(-1)}`);
}
