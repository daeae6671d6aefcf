// Waiting for what the server does on its own (webhooks, the outbox, the periodic jobs).
export const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

/**
 * Polls `check` every 100 ms until it gives something other than undefined, null or false. The
 * limit only turns a wait that will never end into a failure with a name: what the server does on
 * its own can take many seconds on a loaded machine, and waiting longer never passes a wrong result.
 */
export async function waitFor<T>(check: () => Promise<T | undefined | null | false>, what: string, ms = 120_000): Promise<T> {
	const until = Date.now() + ms;
	for (;;) {
		const v = await check();
		if (v !== undefined && v !== null && v !== false) return v;
		if (Date.now() > until) throw new Error(`timed out after ${ms} ms waiting for ${what}`);
		await sleep(100);
	}
}
