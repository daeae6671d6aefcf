// The fonts the app already ships (@fontsource, OFL-licensed), read from node_modules at run time
// for pdfkit: Inter (variable, its default instance, weight 400) for text and IBM Plex Mono for
// figures and headings, the same pair the pages use.
//
// fontkit 2.0 (pdfkit's font engine) cannot subset composite glyphs of a WOFF2 font: it copies
// the glyph's bytes from the glyf table, which in WOFF2 is transformed, and fails with "Offset is
// outside the bounds of the DataView" on any accented letter (ä, ö, é) or quote mark. For WOFF2
// fonts we therefore write every subset glyph as a simple TrueType glyph from its decoded outline
// (OpenType spec, 'glyf' table: simple glyph description), which flattens composites and keeps
// the shapes exactly; hinting instructions are dropped, which PDF viewers do not use.
import { createRequire } from 'node:module';
import { readFileSync } from 'node:fs';

const require = createRequire(import.meta.url);
// pdfkit's own copy of fontkit (CommonJS), so the patch below reaches the class pdfkit uses.
const requireFromPdfkit = createRequire(require.resolve('pdfkit'));

interface PathCommand {
	command: 'moveTo' | 'lineTo' | 'quadraticCurveTo' | 'bezierCurveTo' | 'closePath';
	args: number[];
}
interface FontkitGlyph {
	path: { commands: PathCommand[] };
	advanceWidth: number;
	_getMetrics(): { leftBearing: number };
}
interface FontkitSubset {
	font: { type: string; getGlyph(gid: number): FontkitGlyph };
	glyf: Uint8Array[];
	loca: { offsets: number[] };
	hmtx: { metrics: { advance: number; bearing: number }[] };
	offset: number;
	// A function property, not a method: the patch below keeps the original and calls it with its subset.
	_addGlyph: (this: FontkitSubset, gid: number) => number;
}
interface FontkitFont {
	createSubset(): FontkitSubset;
	hasGlyphForCodePoint(cp: number): boolean;
}
const fontkit = requireFromPdfkit('fontkit') as { create(buffer: Buffer): FontkitFont };

/** A TrueType simple glyph from an outline of lines and quadratic curves (coordinates rounded to font units). */
export function encodeSimpleGlyph(commands: readonly PathCommand[]): Uint8Array {
	const points: [number, number, boolean][] = [];
	const ends: number[] = [];
	const closeContour = () => {
		if (points.length && ends[ends.length - 1] !== points.length - 1) ends.push(points.length - 1);
	};
	for (const c of commands) {
		if (c.command === 'moveTo') {
			closeContour();
			points.push([c.args[0]!, c.args[1]!, true]);
		} else if (c.command === 'lineTo') points.push([c.args[0]!, c.args[1]!, true]);
		else if (c.command === 'quadraticCurveTo') {
			points.push([c.args[0]!, c.args[1]!, false], [c.args[2]!, c.args[3]!, true]);
		} else if (c.command === 'closePath') closeContour();
		else throw new Error('cubic outlines are not TrueType');
	}
	closeContour();
	if (!points.length) return new Uint8Array(0);
	const xs = points.map((p) => Math.round(p[0]));
	const ys = points.map((p) => Math.round(p[1]));
	// header 10 + endPts 2n + instructionLength 2 + a flag byte and two int16 deltas per point
	const size = 10 + 2 * ends.length + 2 + points.length * 5;
	const bytes = new Uint8Array(size + ((4 - (size % 4)) % 4));
	const view = new DataView(bytes.buffer);
	let o = 0;
	view.setInt16(o, ends.length);
	view.setInt16(o + 2, Math.min(...xs));
	view.setInt16(o + 4, Math.min(...ys));
	view.setInt16(o + 6, Math.max(...xs));
	view.setInt16(o + 8, Math.max(...ys));
	o += 10;
	for (const e of ends) {
		view.setUint16(o, e);
		o += 2;
	}
	view.setUint16(o, 0); // no instructions
	o += 2;
	for (const p of points) bytes[o++] = p[2] ? 1 : 0; // ON_CURVE_POINT; deltas are int16 (no short/same flags)
	let last = 0;
	for (const x of xs) {
		view.setInt16(o, x - last);
		last = x;
		o += 2;
	}
	last = 0;
	for (const y of ys) {
		view.setInt16(o, y - last);
		last = y;
		o += 2;
	}
	return bytes;
}

let patched = false;
function patchWoff2Subsetting(sample: FontkitFont) {
	if (patched) return;
	patched = true;
	const proto = Object.getPrototypeOf(sample.createSubset()) as FontkitSubset;
	const original = proto._addGlyph;
	proto._addGlyph = function (this: FontkitSubset, gid: number) {
		if (this.font.type !== 'WOFF2') return original.call(this, gid);
		const glyph = this.font.getGlyph(gid);
		const buffer = encodeSimpleGlyph(glyph.path.commands);
		this.glyf.push(buffer);
		this.loca.offsets.push(this.offset);
		this.hmtx.metrics.push({ advance: glyph.advanceWidth, bearing: glyph._getMetrics().leftBearing });
		this.offset += buffer.length;
		return this.glyf.length - 1;
	};
}

export interface InvoiceFonts {
	text: Buffer;
	mono: Buffer;
	monoBold: Buffer;
	/** Replaces characters the text font lacks by their base letter, or '?', so nothing prints as a box. */
	printable: (text: string) => string;
}

let cached: InvoiceFonts | null = null;

export function invoiceFonts(): InvoiceFonts {
	if (cached) return cached;
	const read = (spec: string) => readFileSync(require.resolve(spec));
	const text = read('@fontsource-variable/inter/files/inter-latin-wght-normal.woff2');
	const mono = read('@fontsource/ibm-plex-mono/files/ibm-plex-mono-latin-400-normal.woff2');
	const monoBold = read('@fontsource/ibm-plex-mono/files/ibm-plex-mono-latin-600-normal.woff2');
	const textFont = fontkit.create(text);
	patchWoff2Subsetting(textFont);
	const has = (ch: string) => ch === '\n' || textFont.hasGlyphForCodePoint(ch.codePointAt(0)!);
	const printable = (s: string) =>
		[...s]
			.map((ch) => {
				if (has(ch)) return ch;
				const base = ch.normalize('NFD').replace(/\p{M}/gu, '');
				return base && [...base].every(has) ? base : '?';
			})
			.join('');
	cached = { text, mono, monoBold, printable };
	return cached;
}
