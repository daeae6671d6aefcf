/**
 * Stripe-style application/x-www-form-urlencoded parsing.
 *
 * Stripe's v1 API takes nested parameters in bracket notation:
 *   line_items[0][price_data][unit_amount]=16000  -> { line_items: [{ price_data: { unit_amount: '16000' } }] }
 *   metadata[bookingId]=b_1                       -> { metadata: { bookingId: 'b_1' } }
 *   expand[]=payment_intent&expand[]=line_items   -> { expand: ['payment_intent', 'line_items'] }
 * The official SDK sends indexed arrays (expand[0]=...), curl users often send `[]`; both are accepted.
 * Values stay strings (as on the wire); callers validate and convert them.
 */

export type FormValue = string | FormValue[] | FormObject;
export interface FormObject {
	[key: string]: FormValue;
}

export class FormParseError extends Error {
	constructor(
		message: string,
		readonly param?: string
	) {
		super(message);
		this.name = 'FormParseError';
	}
}

const MAX_DEPTH = 10;
const MAX_PAIRS = 2000;
const FORBIDDEN_KEYS = new Set(['__proto__', 'prototype', 'constructor']);

/** Intermediate tree: every container is a Map so keys like `__proto__` are inert. */
type Node = string | Container;
interface Container {
	kind: 'container';
	entries: Map<string, Node>;
	pushCount: number;
}

function newContainer(): Container {
	return { kind: 'container', entries: new Map(), pushCount: 0 };
}

function decode(part: string): string {
	try {
		return decodeURIComponent(part.replace(/\+/g, ' '));
	} catch {
		throw new FormParseError(`Invalid percent-encoding in request body near '${part.slice(0, 40)}'`);
	}
}

/** Splits `a[b][0][]` into ['a', 'b', '0', '']. */
function splitKey(rawKey: string): string[] {
	const match = /^([^[\]]+)((?:\[[^[\]]*\])*)$/.exec(rawKey);
	if (!match || match[1] === undefined) {
		throw new FormParseError(`Invalid parameter name: '${rawKey}'`, rawKey);
	}
	const segments = [match[1]];
	const rest = match[2] ?? '';
	for (const seg of rest.matchAll(/\[([^[\]]*)\]/g)) segments.push(seg[1] ?? '');
	if (segments.length > MAX_DEPTH) {
		throw new FormParseError(`Parameter nested too deeply: '${rawKey}'`, rawKey);
	}
	return segments;
}

function displayKey(segments: string[]): string {
	const [head, ...rest] = segments;
	return `${head ?? ''}${rest.map((s) => `[${s}]`).join('')}`;
}

function insert(root: Container, segments: string[], value: string): void {
	let node: Container = root;
	for (let i = 0; i < segments.length; i++) {
		let seg = segments[i] ?? '';
		if (FORBIDDEN_KEYS.has(seg)) {
			throw new FormParseError(`Invalid parameter name: '${displayKey(segments)}'`, displayKey(segments));
		}
		if (seg === '') {
			if (i === 0) throw new FormParseError('Empty parameter name');
			seg = String(node.pushCount++); // `[]` appends a new element
		} else if (/^\d+$/.test(seg)) {
			node.pushCount = Math.max(node.pushCount, Number(seg) + 1);
		}
		const last = i === segments.length - 1;
		const existing = node.entries.get(seg);
		if (last) {
			if (existing !== undefined && typeof existing !== 'string') {
				throw new FormParseError(
					`Invalid value for '${displayKey(segments)}': it is also given as a hash or array`,
					displayKey(segments)
				);
			}
			node.entries.set(seg, value); // a repeated scalar: the last one wins
			return;
		}
		if (existing === undefined) {
			const child = newContainer();
			node.entries.set(seg, child);
			node = child;
		} else if (typeof existing === 'string') {
			const prefix = displayKey(segments.slice(0, i + 1));
			throw new FormParseError(`Invalid value for '${prefix}': it is given both as a string and as a hash or array`, prefix);
		} else {
			node = existing;
		}
	}
}

function finish(node: Node): FormValue {
	if (typeof node === 'string') return node;
	const keys = [...node.entries.keys()];
	if (keys.length > 0 && keys.every((k) => /^\d+$/.test(k))) {
		// An array; gaps are compacted (Stripe's SDKs always send 0..n-1).
		return keys
			.map((k) => Number(k))
			.sort((a, b) => a - b)
			.map((k) => finish(node.entries.get(String(k)) as Node));
	}
	const out: FormObject = Object.create(null) as FormObject;
	for (const [k, v] of node.entries) out[k] = finish(v);
	return out;
}

export function parseForm(body: string): FormObject {
	const root = newContainer();
	const pairs = body.split('&').filter((p) => p.length > 0);
	if (pairs.length > MAX_PAIRS) throw new FormParseError('Too many parameters in request');
	for (const pair of pairs) {
		const eq = pair.indexOf('=');
		const rawKey = decode(eq === -1 ? pair : pair.slice(0, eq));
		const value = eq === -1 ? '' : decode(pair.slice(eq + 1));
		insert(root, splitKey(rawKey), value);
	}
	return finish(root) as FormObject;
}

/** JSON with object keys sorted at every level: equal parameters give equal strings. */
export function stableStringify(value: unknown): string {
	if (value === null || typeof value !== 'object') return JSON.stringify(value) ?? 'null';
	if (Array.isArray(value)) return `[${value.map((v) => stableStringify(v)).join(',')}]`;
	const obj = value as Record<string, unknown>;
	const keys = Object.keys(obj).sort();
	return `{${keys.map((k) => `${JSON.stringify(k)}:${stableStringify(obj[k])}`).join(',')}}`;
}
