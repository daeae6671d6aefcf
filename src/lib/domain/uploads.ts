// The artist's uploads (reference tracks, lyric sheets): which files a booking takes, how much,
// and how a file's name is shown and offered for download. Plain rules, no I/O.
//
// OWASP ASVS 5.0: 5.2.1 (a size limit per file, and per booking), 5.2.2 (the type is decided from
// the file's content, never its name or the browser's claim), 5.3.2 (storage paths are the
// server's own; the client's name is display text only).

export const MIB = 1024 * 1024;
export const DEFAULT_MAX_FILE_BYTES = 50 * MIB;
export const MAX_FILES_PER_BOOKING = 10;
export const MAX_BYTES_PER_BOOKING = 200 * MIB;
/** Bytes kept in memory from the start of a file to recognise its type. */
export const SNIFF_BYTES = 64 * 1024;

export interface UploadLimits {
	maxFileBytes: number;
	maxFiles: number;
	maxTotalBytes: number;
}

/** The limits from the environment (UPLOAD_MAX_BYTES); anything unreadable falls back to the default. */
export function uploadLimits(maxFileBytes: string | undefined): UploadLimits {
	const n = Number(maxFileBytes);
	const perFile = Number.isSafeInteger(n) && n > 0 ? n : DEFAULT_MAX_FILE_BYTES;
	return { maxFileBytes: perFile, maxFiles: MAX_FILES_PER_BOOKING, maxTotalBytes: Math.max(MAX_BYTES_PER_BOOKING, perFile) };
}

export interface AcceptedType {
	/** The content type stored and sent back on download. */
	contentType: string;
	label: string;
	/** Extensions a download name may keep; the first is added when the name has none of them. */
	extensions: string[];
}

/**
 * What a booking takes, keyed by what the `file-type` package reports (its MIME names).
 * Audio an engineer can load, PDFs and plain-text lyric sheets.
 */
const ACCEPTED: Record<string, AcceptedType> = {
	'audio/wav': { contentType: 'audio/wav', label: 'WAV audio', extensions: ['wav', 'wave'] },
	'audio/aiff': { contentType: 'audio/aiff', label: 'AIFF audio', extensions: ['aif', 'aiff', 'aifc'] },
	'audio/flac': { contentType: 'audio/flac', label: 'FLAC audio', extensions: ['flac'] },
	'audio/mpeg': { contentType: 'audio/mpeg', label: 'MP3 audio', extensions: ['mp3'] },
	'audio/ogg': { contentType: 'audio/ogg', label: 'Ogg audio', extensions: ['ogg', 'oga'] },
	'audio/ogg; codecs=opus': { contentType: 'audio/ogg; codecs=opus', label: 'Opus audio', extensions: ['opus', 'ogg'] },
	'audio/x-m4a': { contentType: 'audio/mp4', label: 'M4A audio', extensions: ['m4a', 'mp4'] },
	'audio/mp4': { contentType: 'audio/mp4', label: 'M4A audio', extensions: ['m4a', 'mp4'] },
	'audio/aac': { contentType: 'audio/aac', label: 'AAC audio', extensions: ['aac'] },
	'application/pdf': { contentType: 'application/pdf', label: 'PDF', extensions: ['pdf'] }
};

export const PLAIN_TEXT: AcceptedType = { contentType: 'text/plain; charset=utf-8', label: 'Text', extensions: ['txt'] };

/** What the page and the error messages say is accepted. */
export const ACCEPTED_SUMMARY = 'audio (WAV, AIFF, FLAC, MP3, Ogg/Opus, M4A/AAC), PDF, or a plain-text lyric sheet (.txt)';
/** For the file picker's `accept` (a hint only: the server decides from the content). */
export const ACCEPT_ATTRIBUTE =
	'.wav,.wave,.aif,.aiff,.aifc,.flac,.mp3,.ogg,.oga,.opus,.m4a,.aac,.pdf,.txt,audio/*,application/pdf,text/plain';

export function labelFor(contentType: string): string {
	if (contentType === PLAIN_TEXT.contentType) return PLAIN_TEXT.label;
	return Object.values(ACCEPTED).find((t) => t.contentType === contentType)?.label ?? contentType;
}

export type ContentVerdict = { ok: true; type: AcceptedType } | { ok: false; message: string };

/**
 * Decides a file's type from its content. `detected` is the signature found in its first bytes
 * (none for text); `utf8Text` says whether the whole file is UTF-8 without NUL bytes; `head` is
 * its first bytes. Plain text is taken only under a .txt name, and never when it starts like
 * markup (HTML, SVG, XML), which a browser could be talked into running.
 */
export function judgeContent(
	detected: { mime: string; ext: string } | undefined,
	utf8Text: boolean,
	head: Uint8Array,
	name: string
): ContentVerdict {
	const refuse = (found: string) => ({
		ok: false as const,
		message: `“${name}” is ${found}. This booking takes ${ACCEPTED_SUMMARY}.`
	});
	if (detected) {
		const type = ACCEPTED[detected.mime];
		return type ? { ok: true, type } : refuse(`${detected.ext.toUpperCase()} data, whatever its name says`);
	}
	if (!utf8Text) return refuse('not a kind of file we recognise');
	if (looksLikeMarkup(head)) return refuse('a web page or markup, not a plain-text lyric sheet');
	if (extensionOf(name) !== 'txt') return refuse('plain text; name it .txt if it is a lyric sheet');
	return { ok: true, type: PLAIN_TEXT };
}

function looksLikeMarkup(head: Uint8Array): boolean {
	const start = new TextDecoder('utf-8', { fatal: false })
		.decode(head.subarray(0, 1024))
		.replace(/^\uFEFF/, '')
		.trimStart();
	return /^<[!?a-z/]/i.test(start);
}

/** Follows a file chunk by chunk: true at the end when it is all valid UTF-8 with no NUL byte. */
export class Utf8TextCheck {
	private decoder = new TextDecoder('utf-8', { fatal: true });
	private ok = true;
	push(chunk: Uint8Array) {
		if (!this.ok) return;
		if (chunk.includes(0)) {
			this.ok = false;
			return;
		}
		try {
			this.decoder.decode(chunk, { stream: true });
		} catch {
			this.ok = false;
		}
	}
	finish(): boolean {
		if (!this.ok) return false;
		try {
			this.decoder.decode();
			return true;
		} catch {
			return false;
		}
	}
}

const MAX_NAME_LENGTH = 200;

/**
 * The client's file name as display text: no folder parts, no control or bidirectional-override
 * characters (which can disguise an extension), at most 200 characters.
 */
export function displayName(raw: string | undefined | null): string {
	let name = (raw ?? '').normalize('NFC');
	name = name.split(/[/\\]/).pop() ?? '';
	// C0 and C1 controls, and the Unicode bidi embedding, override and isolate marks.
	// eslint-disable-next-line no-control-regex -- matching control characters is the point
	name = name.replace(/[\u0000-\u001f\u007f-\u009f\u200e\u200f\u202a-\u202e\u2066-\u2069]/g, '');
	name = name.replace(/\s+/g, ' ').trim();
	if (name === '.' || name === '..') name = '';
	if (name.length > MAX_NAME_LENGTH) {
		const ext = extensionOf(name);
		const keep = ext && ext.length < 10 ? `.${ext}` : '';
		name = name.slice(0, MAX_NAME_LENGTH - keep.length) + keep;
	}
	return name || 'upload';
}

function extensionOf(name: string): string {
	const dot = name.lastIndexOf('.');
	return dot > 0 ? name.slice(dot + 1).toLowerCase() : '';
}

/** The name a download is saved under: the display name, with an extension that matches its content. */
export function downloadName(name: string, contentType: string): string {
	const type =
		contentType === PLAIN_TEXT.contentType ? PLAIN_TEXT : Object.values(ACCEPTED).find((t) => t.contentType === contentType);
	if (!type || type.extensions.includes(extensionOf(name))) return name;
	return `${name}.${type.extensions[0]}`;
}

/**
 * A Content-Disposition value for an attachment (RFC 6266): an ASCII fallback in `filename` and
 * the full name in `filename*` as RFC 8187 UTF-8 percent-encoding.
 */
export function attachmentDisposition(name: string): string {
	const ascii = name
		.normalize('NFKD')
		.replace(/[\u0300-\u036f]/g, '')
		.replace(/[^\x20-\x7e]|["\\%;]/g, '_');
	const encoded = encodeURIComponent(name).replace(/['()*]/g, (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`);
	return `attachment; filename="${ascii}"; filename*=UTF-8''${encoded}`;
}

export interface BookingUsage {
	files: number;
	bytes: number;
}

/** Why one more file does not fit the booking, or null when it does. `size` is unknown while streaming. */
export function quotaProblem(used: BookingUsage, limits: UploadLimits, size?: number): string | null {
	if (used.files >= limits.maxFiles) return `A booking holds at most ${limits.maxFiles} files. Remove one to add another.`;
	if (size !== undefined) {
		if (size > limits.maxFileBytes) return `A file can be at most ${formatBytes(limits.maxFileBytes)}.`;
		if (used.bytes + size > limits.maxTotalBytes) {
			return `The files for a booking can add up to ${formatBytes(limits.maxTotalBytes)}; ${formatBytes(Math.max(0, limits.maxTotalBytes - used.bytes))} is left.`;
		}
	}
	return null;
}

/** Bytes this booking can still take in one file. */
export function roomForOneFile(used: BookingUsage, limits: UploadLimits): number {
	return Math.max(0, Math.min(limits.maxFileBytes, limits.maxTotalBytes - used.bytes));
}

export function formatBytes(n: number): string {
	if (n < 1024) return `${n} B`;
	if (n < MIB) return `${(n / 1024).toFixed(n < 10 * 1024 ? 1 : 0)} KB`;
	const mib = n / MIB;
	return `${Number.isInteger(mib) ? mib : mib.toFixed(1)} MB`;
}
