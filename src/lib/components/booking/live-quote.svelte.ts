// The price of the booking being chosen, from the studio's POST /api/studios/STUDIO/quote: asked again a moment after the
// choices stop changing, with an older answer dropped when a newer question is on its way.
import type { QuoteView } from '$lib/types/quote';
import { studioApiPath } from '$lib/studio-paths';

import type { BookingRequest } from '$lib/schemas/booking';

export type QuoteBody = BookingRequest;

export class LiveQuote {
	quote = $state<QuoteView | null>(null);
	/** The server's field messages (422), by the API's field names (room, start, end, gear …). */
	fields = $state<Record<string, string[]>>({});
	message = $state('');
	pending = $state(false);

	#timer: ReturnType<typeof setTimeout> | undefined;
	#controller: AbortController | undefined;
	#lastKey = '';

	/** `studio`: the short name of the studio whose prices are asked. */
	constructor(
		private readonly studio: string,
		private readonly delayMs = 250
	) {}

	/** Asks for the price of `body` unless it is the question already asked. */
	request(body: QuoteBody): void {
		const key = JSON.stringify(body);
		if (key === this.#lastKey) return;
		this.#lastKey = key;
		clearTimeout(this.#timer);
		this.#controller?.abort();
		this.pending = true;
		this.#timer = setTimeout(() => void this.#send(key), this.delayMs);
	}

	/** Nothing to price yet (no date or start): clear the last answer. */
	clear(): void {
		clearTimeout(this.#timer);
		this.#controller?.abort();
		this.#lastKey = '';
		this.quote = null;
		this.fields = {};
		this.message = '';
		this.pending = false;
	}

	async #send(key: string): Promise<void> {
		const controller = new AbortController();
		this.#controller = controller;
		try {
			const res = await fetch(studioApiPath(this.studio, 'quote'), {
				method: 'POST',
				headers: { 'content-type': 'application/json', accept: 'application/json' },
				body: key,
				signal: controller.signal
			});
			const json = (await res.json().catch(() => null)) as
				(QuoteView & { message?: undefined }) | { message?: string; fields?: Record<string, string[]> } | null;
			if (controller.signal.aborted) return;
			if (res.ok && json && 'lines' in json) {
				this.quote = json;
				this.fields = {};
				this.message = '';
			} else if (res.status === 422 && json && !('lines' in json)) {
				// No price for a booking that cannot be made: the messages say what to change.
				this.quote = null;
				this.fields = json.fields ?? {};
				this.message = json.message ?? 'Some details need another look.';
			} else {
				this.quote = null;
				this.fields = {};
				this.message = 'The price could not be worked out just now. Your choices are kept; try again in a moment.';
				this.#lastKey = '';
			}
		} catch {
			if (controller.signal.aborted) return;
			this.quote = null;
			this.message = 'The studio could not be reached to price this. Your choices are kept; check the connection.';
			this.#lastKey = '';
		} finally {
			if (!controller.signal.aborted) this.pending = false;
		}
	}

	destroy(): void {
		clearTimeout(this.#timer);
		this.#controller?.abort();
	}
}
