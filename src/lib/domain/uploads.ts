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

/** What a file's text check found over the whole file (see TextCheck). */
export type TextFinding = 'text' | 'not-utf8' | 'control' | 'markup';

/** Types that file-type recognises by a frame sync of a few bits: a match proves little alone. */
const WEAK_SIGNATURES: Record<string, 'mpeg' | 'adts'> = { 'audio/mpeg': 'mpeg', 'audio/aac': 'adts' };
/** Consecutive audio frames that must follow one another for a weak signature to count. */
export const MIN_FRAME_CHAIN = 4;
/** How far past the start of the audio the first frame may sit (encoders leave some padding). */
const FRAME_SEARCH_BYTES = 4096;
/** Bytes read at the start of the audio to follow its frames: the search plus four of the longest frames. */
export const PROBE_BYTES = 16 * 1024;

/**
 * Decides a file's type from its content, throughout (OWASP ASVS 5.2.2): a file must be what its
 * content says, not just start like it.
 *
 * - `detected`: the signature file-type found in its first bytes (none for text).
 * - `text`: what the text check found over the whole file.
 * - `head`: its first bytes (up to SNIFF_BYTES).
 * - `probe`: for MP3 and AAC, the bytes where the audio starts (after any ID3 tag; see
 *   `audioStart`). Their signature is a frame sync of a dozen bits, which text can carry by
 *   accident or on purpose, so the frames must follow one another as real audio does.
 *
 * Audio and PDF files are refused when web markup (an HTML document, a script) sits in their
 * first bytes: that is a page dressed as a file. Plain text is taken only under a .txt name, when
 * it is UTF-8 throughout without NUL or other control bytes, and holds no HTML, SVG or script.
 */
export function judgeContent(input: {
	detected: { mime: string; ext: string } | undefined;
	text: TextFinding;
	head: Uint8Array;
	probe?: Uint8Array;
	name: string;
}): ContentVerdict {
	const { detected, text, head, probe, name } = input;
	const refuse = (found: string) => ({
		ok: false as const,
		message: `“${name}” is ${found}. This booking takes ${ACCEPTED_SUMMARY}.`
	});
	if (detected) {
		const type = ACCEPTED[detected.mime];
		if (!type) return refuse(`${detected.ext.toUpperCase()} data, whatever its name says`);
		const weak = WEAK_SIGNATURES[detected.mime];
		if (weak && !hasFrameChain(probe ?? head, weak)) return refuse(`not ${type.label}: it only starts like it`);
		if (holdsWebMarkup(head)) return refuse(`a web page behind a ${type.label} header`);
		return { ok: true, type };
	}
	if (text === 'not-utf8') return refuse('not a kind of file we recognise');
	if (text === 'control') return refuse('not plain text: it holds control characters');
	if (text === 'markup' || looksLikeMarkup(head)) return refuse('a web page or markup, not a plain-text lyric sheet');
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

/** Tags that make a browser run or render a page (HTML Living Standard, SVG), anywhere in text. */
const MARKUP_IN_TEXT =
	/<\s*\/?\s*(?:!doctype|html|head|body|script|iframe|frame|frameset|object|embed|svg|math|style|link|meta|base|form|img|\?xml)\b/i;
/** The same, in binary data: only what begins a page or a script, which real audio never spells out. */
const MARKUP_IN_BINARY =
	/<(?:!doctype\s+html|html[\s>]|head[\s>]|body[\s>]|script[\s>]|iframe[\s>]|svg[\s>]|object[\s>]|embed[\s>])/i;

function holdsWebMarkup(bytes: Uint8Array): boolean {
	// latin1 maps every byte to one character, so binary data decodes without loss or error.
	return MARKUP_IN_BINARY.test(new TextDecoder('latin1').decode(bytes));
}

/** Where the audio frames of an MP3 begin: after any ID3v2 tags (ID3v2.4 §3.1, a synchsafe size). */
export function audioStart(head: Uint8Array): number {
	let at = 0;
	while (at + 10 <= head.length && head[at] === 0x49 && head[at + 1] === 0x44 && head[at + 2] === 0x33) {
		const size =
			((head[at + 6]! & 0x7f) << 21) | ((head[at + 7]! & 0x7f) << 14) | ((head[at + 8]! & 0x7f) << 7) | (head[at + 9]! & 0x7f);
		const footer = head[at + 5]! & 0x10 ? 10 : 0;
		at += 10 + size + footer;
	}
	return at;
}

// MPEG-1/2 audio frame headers (ISO/IEC 11172-3 and 13818-3): kbit/s by version and layer.
const BITRATES: Record<string, number[]> = {
	'1-1': [0, 32, 64, 96, 128, 160, 192, 224, 256, 288, 320, 352, 384, 416, 448],
	'1-2': [0, 32, 48, 56, 64, 80, 96, 112, 128, 160, 192, 224, 256, 320, 384],
	'1-3': [0, 32, 40, 48, 56, 64, 80, 96, 112, 128, 160, 192, 224, 256, 320],
	'2-1': [0, 32, 48, 56, 64, 80, 96, 112, 128, 144, 160, 176, 192, 224, 256],
	'2-2': [0, 8, 16, 24, 32, 40, 48, 56, 64, 80, 96, 112, 128, 144, 160],
	'2-3': [0, 8, 16, 24, 32, 40, 48, 56, 64, 80, 96, 112, 128, 144, 160]
};
const SAMPLE_RATES: Record<number, number[]> = { 3: [44100, 48000, 32000], 2: [22050, 24000, 16000], 0: [11025, 12000, 8000] };

/** The length of the MPEG audio frame whose header is at `at`, or 0 when there is none. */
export function mpegFrameLength(b: Uint8Array, at: number): number {
	if (at + 4 > b.length || b[at] !== 0xff || (b[at + 1]! & 0xe0) !== 0xe0) return 0;
	const version = (b[at + 1]! >> 3) & 3; // 3: MPEG-1, 2: MPEG-2, 0: MPEG-2.5, 1: reserved
	const layer = 4 - ((b[at + 1]! >> 1) & 3); // 1, 2 or 3; 4 is reserved
	const bitrateIndex = b[at + 2]! >> 4;
	const rateIndex = (b[at + 2]! >> 2) & 3;
	const padding = (b[at + 2]! >> 1) & 1;
	if (version === 1 || layer === 4 || bitrateIndex === 0 || bitrateIndex === 15 || rateIndex === 3) return 0;
	const kbps = BITRATES[`${version === 3 ? 1 : 2}-${layer}`]![bitrateIndex]!;
	const rate = SAMPLE_RATES[version]![rateIndex]!;
	if (layer === 1) return (Math.floor((12 * kbps * 1000) / rate) + padding) * 4;
	const perFrame = layer === 3 && version !== 3 ? 72 : 144;
	return Math.floor((perFrame * kbps * 1000) / rate) + padding;
}

/** The length of the ADTS (AAC) frame at `at` (ISO/IEC 13818-7 §6.2), or 0 when there is none. */
export function adtsFrameLength(b: Uint8Array, at: number): number {
	if (at + 7 > b.length || b[at] !== 0xff || (b[at + 1]! & 0xf6) !== 0xf0) return 0;
	if (((b[at + 2]! >> 2) & 0xf) > 12) return 0;
	const length = ((b[at + 3]! & 0x03) << 11) | (b[at + 4]! << 3) | (b[at + 5]! >> 5);
	const headerLength = b[at + 1]! & 1 ? 7 : 9;
	return length > headerLength ? length : 0;
}

/**
 * Do at least MIN_FRAME_CHAIN frames follow one another, each header where the one before it
 * ends, starting within the first few KB of `bytes`?
 */
export function hasFrameChain(bytes: Uint8Array, kind: 'mpeg' | 'adts'): boolean {
	const frameLength = kind === 'mpeg' ? mpegFrameLength : adtsFrameLength;
	const searchEnd = Math.min(bytes.length, FRAME_SEARCH_BYTES);
	for (let start = 0; start < searchEnd; start++) {
		if (bytes[start] !== 0xff) continue;
		let at = start;
		let frames = 0;
		while (frames < MIN_FRAME_CHAIN) {
			const length = frameLength(bytes, at);
			if (!length) break;
			frames++;
			at += length;
		}
		if (frames >= MIN_FRAME_CHAIN) return true;
	}
	return false;
}

/**
 * Follows a file chunk by chunk and says at the end whether it is plain text throughout: valid
 * UTF-8, no NUL or other control characters (tab, line feed, carriage return and form feed are
 * text), and no HTML, SVG or script tags anywhere.
 */
export class TextCheck {
	private decoder = new TextDecoder('utf-8', { fatal: true });
	private finding: TextFinding = 'text';
	/** The end of the text so far, so that a tag split across two chunks is still seen. */
	private tail = '';

	push(chunk: Uint8Array) {
		if (this.finding === 'not-utf8') return;
		let text: string;
		try {
			text = this.decoder.decode(chunk, { stream: true });
		} catch {
			this.finding = 'not-utf8';
			return;
		}
		this.look(text);
	}

	finish(): TextFinding {
		if (this.finding === 'not-utf8') return this.finding;
		try {
			this.look(this.decoder.decode());
		} catch {
			this.finding = 'not-utf8';
		}
		return this.finding;
	}

	private look(text: string) {
		if (this.finding !== 'text') return;
		// eslint-disable-next-line no-control-regex -- matching control characters is the point
		if (/[\u0000-\u0008\u000b\u000e-\u001f\u007f-\u009f]/.test(text)) {
			this.finding = 'control';
			return;
		}
		const window = this.tail + text;
		if (MARKUP_IN_TEXT.test(window)) this.finding = 'markup';
		this.tail = window.slice(-32);
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
