// What the server may write to its log about a failure. A session token, a feed token or a cookie
// in a log is as good as a password to whoever reads the log (OWASP ASVS 16.2.5: no credentials or
// session tokens in logs), and failures carry them in surprising places: a failed query's error
// message lists its parameters, a request's path holds a feed token. So errors are described by
// their kind, code and redacted message, never printed whole.

const REDACTED = '[redacted]';
/** How many causes deep an error is described. */
const MAX_CAUSES = 5;

/**
 * Removes secrets from one piece of text: a query's parameter list (everything from
 * "params:" on, as Drizzle words its failures), cookie and authorization values, and any long
 * run of token characters that looks random (has a digit, or both cases). Words such as
 * INTERNAL_SERVER_ERROR or table names stay readable.
 */
export function redactText(text: string): string {
	return text
		.replace(/\bparams:[\s\S]*$/i, `params: ${REDACTED}`)
		.replace(/\b(cookie|set-cookie|authorization)(["']?\s*[:=]\s*)[^\n]*/gi, `$1$2${REDACTED}`)
		.replace(/\b(bearer|basic)\s+\S+/gi, `$1 ${REDACTED}`)
		.replace(/[A-Za-z0-9_\-+]{16,}={0,2}/g, (run) => (looksRandom(run) ? REDACTED : run));
}

/** Long, and with a digit or both cases: a token, a key or a hash rather than a word. */
function looksRandom(run: string): boolean {
	return /\d/.test(run) || (/[a-z]/.test(run) && /[A-Z]/.test(run));
}

interface ErrorLike {
	name?: unknown;
	message?: unknown;
	code?: unknown;
	stack?: unknown;
	cause?: unknown;
}

/**
 * One error as log text: "Kind [code]: redacted first line", the same for each cause, then the
 * top error's stack frames (file positions only, no message text).
 */
export function describeError(e: unknown): string {
	const parts: string[] = [];
	let cur: unknown = e;
	for (let depth = 0; cur !== undefined && cur !== null && depth < MAX_CAUSES; depth++) {
		parts.push(depth === 0 ? describeOne(cur) : `caused by ${describeOne(cur)}`);
		cur = typeof cur === 'object' ? (cur as ErrorLike).cause : undefined;
	}
	const stack = typeof e === 'object' && e !== null && typeof (e as ErrorLike).stack === 'string' ? (e as ErrorLike).stack : '';
	const frames = (stack as string)
		.split('\n')
		.filter((line) => /^\s+at /.test(line))
		.slice(0, 12)
		.map((line) => redactText(line));
	return [...parts, ...frames].join('\n');
}

function describeOne(e: unknown): string {
	if (typeof e !== 'object' || e === null) return `${typeof e} value`;
	const err = e as ErrorLike;
	const name = typeof err.name === 'string' ? err.name : (e.constructor?.name ?? 'Error');
	const code = typeof err.code === 'string' || typeof err.code === 'number' ? ` [${err.code}]` : '';
	const message = typeof err.message === 'string' ? redactText(err.message).split('\n')[0]!.slice(0, 300) : '';
	return `${name}${code}${message ? `: ${message}` : ''}`;
}

/** Log arguments made safe: strings redacted, errors described, anything else named by its kind. */
export function safeLogArgs(args: unknown[]): string[] {
	return args.map((a) => (typeof a === 'string' ? redactText(a) : a instanceof Error ? describeError(a) : describeValue(a)));
}

function describeValue(a: unknown): string {
	if (a === null || a === undefined || typeof a === 'number' || typeof a === 'boolean') return String(a);
	if (typeof a === 'object' && 'message' in a) return describeError(a);
	return `(${typeof a === 'object' ? (a.constructor?.name ?? 'object') : typeof a} not logged)`;
}
