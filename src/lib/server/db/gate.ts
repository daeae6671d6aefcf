// A counted gate in front of the connection pool: at most `size` database operations (a query or
// a whole transaction) run at once, one per pooled connection, and the rest wait their turn in
// order. postgres.js itself queues work behind busy connections without any limit on the wait;
// this gate bounds the wait, so a request that cannot get a connection in time fails with
// PoolBusyError ("busy") instead of hanging, and a busy pool is never mistaken for an outage.

/** No connection came free within the time a request may wait for one. */
export class PoolBusyError extends Error {
	readonly code = 'POOL_BUSY';
	constructor(readonly waitedMs: number) {
		super(`no database connection came free within ${waitedMs} ms`);
		this.name = 'PoolBusyError';
	}
}

interface Waiter {
	grant: () => void;
	timer: ReturnType<typeof setTimeout>;
}

export class Gate {
	private inUse = 0;
	private readonly queue: Waiter[] = [];

	constructor(
		readonly size: number,
		readonly waitMs: number
	) {
		if (!Number.isInteger(size) || size < 1) throw new Error(`the pool size must be a whole number of at least 1, not ${size}`);
		if (!(waitMs > 0)) throw new Error(`the pool wait must be a positive number of milliseconds, not ${waitMs}`);
	}

	/** Operations running now, and operations waiting for a turn. */
	get load() {
		return { running: this.inUse, waiting: this.queue.length };
	}

	/** A turn: resolves with its release (safe to call twice), or rejects with PoolBusyError after `waitMs`. */
	acquire(waitMs = this.waitMs): Promise<() => void> {
		if (this.inUse < this.size && this.queue.length === 0) {
			this.inUse++;
			return Promise.resolve(this.releaser());
		}
		return new Promise((resolve, reject) => {
			const waiter: Waiter = {
				grant: () => resolve(this.releaser()),
				timer: setTimeout(() => {
					const at = this.queue.indexOf(waiter);
					if (at >= 0) this.queue.splice(at, 1);
					reject(new PoolBusyError(waitMs));
				}, waitMs)
			};
			this.queue.push(waiter);
		});
	}

	/** Runs `work` in a turn of its own; the turn ends when the work settles. */
	async run<T>(work: () => PromiseLike<T>, waitMs?: number): Promise<T> {
		const release = await this.acquire(waitMs);
		try {
			return await work();
		} finally {
			release();
		}
	}

	private releaser() {
		let done = false;
		return () => {
			if (done) return;
			done = true;
			const next = this.queue.shift();
			if (next) {
				// The turn passes straight to the next in line: the count stays the same.
				clearTimeout(next.timer);
				next.grant();
			} else {
				this.inUse--;
			}
		};
	}
}
