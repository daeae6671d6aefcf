import { describe, expect, it } from 'vitest';
import {
	attachmentDisposition,
	DEFAULT_MAX_FILE_BYTES,
	displayName,
	downloadName,
	judgeContent,
	MIB,
	quotaProblem,
	roomForOneFile,
	uploadLimits,
	ACCEPT_ATTRIBUTE,
	PROBE_BYTES,
	TextCheck,
	audioStart,
	adtsFrameLength,
	formatBytes,
	hasFrameChain,
	labelFor,
	mpegFrameLength,
	type AcceptedType,
	type TextFinding
} from './uploads';

const bytes = (s: string) => new TextEncoder().encode(s);

describe('upload limits', () => {
	it('takes UPLOAD_MAX_BYTES when it is a positive whole number, else 50 MiB', () => {
		expect(uploadLimits(undefined).maxFileBytes).toBe(DEFAULT_MAX_FILE_BYTES);
		expect(uploadLimits('1048576').maxFileBytes).toBe(MIB);
		for (const bad of ['', '0', '-5', '12.5', 'lots']) expect(uploadLimits(bad).maxFileBytes).toBe(DEFAULT_MAX_FILE_BYTES);
		expect(uploadLimits(undefined)).toMatchObject({ maxFiles: 10, maxTotalBytes: 200 * MIB });
	});

	it('refuses an eleventh file, a file over the limit and a file past the booking total (ASVS 5.2.1)', () => {
		const lim = uploadLimits(String(50 * MIB));
		expect(quotaProblem({ files: 9, bytes: 0 }, lim)).toBeNull();
		expect(quotaProblem({ files: 10, bytes: 0 }, lim)).toMatch(/at most 10 files/);
		expect(quotaProblem({ files: 0, bytes: 0 }, lim, 50 * MIB)).toBeNull();
		expect(quotaProblem({ files: 0, bytes: 0 }, lim, 50 * MIB + 1)).toMatch(/at most 50 MB/);
		expect(quotaProblem({ files: 4, bytes: 180 * MIB }, lim, 30 * MIB)).toMatch(/add up to 200 MB; 20 MB is left/);
		expect(roomForOneFile({ files: 4, bytes: 180 * MIB }, lim)).toBe(20 * MIB);
		expect(roomForOneFile({ files: 0, bytes: 0 }, lim)).toBe(50 * MIB);
	});
});

type Detected = { mime: string; ext: string } | undefined;
const judge = (detected: Detected, text: TextFinding, head: Uint8Array, name: string, probe?: Uint8Array) =>
	judgeContent({ detected, text, head, name, probe });
const none = new Uint8Array();

/** An MPEG-1 Layer III frame header, 128 kbit/s at 44.1 kHz: frames of 417 bytes. */
const MP3_HEADER = [0xff, 0xfb, 0x90, 0x64];
/** `count` such frames, one after another, their bodies zero. */
function mp3Frames(count: number): Uint8Array {
	const out = new Uint8Array(417 * count);
	for (let i = 0; i < count; i++) out.set(MP3_HEADER, i * 417);
	return out;
}
const concat = (...parts: Uint8Array[]) => {
	const out = new Uint8Array(parts.reduce((n, p) => n + p.length, 0));
	let at = 0;
	for (const p of parts) {
		out.set(p, at);
		at += p.length;
	}
	return out;
};
/** An ID3v2.3 tag of `size` bytes after its header (a synchsafe size). */
function id3(size: number): Uint8Array {
	const tag = new Uint8Array(10 + size);
	tag.set([0x49, 0x44, 0x33, 3, 0, 0, (size >> 21) & 0x7f, (size >> 14) & 0x7f, (size >> 7) & 0x7f, size & 0x7f]);
	return tag;
}
const MP3 = { mime: 'audio/mpeg', ext: 'mp3' };

describe('the type of a file comes from its content (ASVS 5.2.2)', () => {
	it('takes the audio and PDF signatures it knows, whatever the name', () => {
		const wav = judge({ mime: 'audio/wav', ext: 'wav' }, 'not-utf8', none, 'take 3.pdf');
		expect(wav).toMatchObject({ ok: true, type: { contentType: 'audio/wav' } });
		expect(judge({ mime: 'audio/x-m4a', ext: 'm4a' }, 'not-utf8', none, 'x')).toMatchObject({
			ok: true,
			type: { contentType: 'audio/mp4' }
		});
		expect(judge({ mime: 'application/pdf', ext: 'pdf' }, 'not-utf8', none, 'x')).toMatchObject({ ok: true });
	});

	it('refuses other signatures, naming what the file really is', () => {
		const exe = judge({ mime: 'application/x-msdownload', ext: 'exe' }, 'not-utf8', none, 'track.wav');
		expect(exe.ok).toBe(false);
		if (!exe.ok) expect(exe.message).toMatch(/“track.wav” is EXE data/);
		expect(judge({ mime: 'video/mp4', ext: 'mp4' }, 'not-utf8', none, 'a.m4a').ok).toBe(false);
	});

	it('reads MPEG audio frame lengths from their headers', () => {
		expect(mpegFrameLength(new Uint8Array(MP3_HEADER), 0)).toBe(417);
		expect(mpegFrameLength(new Uint8Array([0xff, 0xfb, 0x92, 0x64]), 0)).toBe(418); // padded
		expect(mpegFrameLength(new Uint8Array([0xff, 0xfb, 0xf0, 0x64]), 0)).toBe(0); // bitrate index 15
		expect(mpegFrameLength(new Uint8Array([0xff, 0xfb, 0x9c, 0x64]), 0)).toBe(0); // reserved sample rate
	});

	it('takes MP3 only when its frames follow one another, after any ID3 tag', () => {
		const frames = mp3Frames(6);
		expect(hasFrameChain(frames, 'mpeg')).toBe(true);
		expect(judge(MP3, 'not-utf8', frames, 'take.mp3', frames)).toMatchObject({ ok: true, type: { contentType: 'audio/mpeg' } });
		const tagged = concat(id3(2000), frames);
		expect(audioStart(tagged)).toBe(2010);
		expect(judge(MP3, 'not-utf8', tagged, 'take.mp3', tagged.subarray(audioStart(tagged))).ok).toBe(true);
		// A little padding before the first frame is allowed.
		expect(hasFrameChain(concat(new Uint8Array(100), frames), 'mpeg')).toBe(true);
	});

	it('refuses a frame header followed by a web page, or by anything but more frames', () => {
		const page = bytes('<!DOCTYPE html><html><body><script>fetch("/api/bookings")</script></body></html>'.repeat(20));
		const disguised = concat(new Uint8Array(MP3_HEADER), page);
		expect(hasFrameChain(disguised, 'mpeg')).toBe(false);
		const verdict = judge(MP3, 'not-utf8', disguised, 'take.mp3', disguised);
		expect(verdict.ok).toBe(false);
		if (!verdict.ok) expect(verdict.message).toMatch(/only starts like it/);
		expect(judge(MP3, 'not-utf8', concat(id3(20), disguised), 'take.mp3', disguised).ok).toBe(false);
		expect(judge(MP3, 'not-utf8', mp3Frames(3), 'short.mp3', mp3Frames(3)).ok).toBe(false);
		expect(hasFrameChain(concat(new Uint8Array(MP3_HEADER), new Uint8Array(5000).fill(0x41)), 'mpeg')).toBe(false);
	});

	it('refuses audio or PDF whose first bytes hold an HTML page or a script', () => {
		const frames = mp3Frames(6);
		const html = bytes('<html><script>alert(1)</script></html>');
		const withPage = concat(frames, html);
		expect(judge(MP3, 'not-utf8', withPage, 'take.mp3', withPage).ok).toBe(false);
		const wav = concat(bytes('RIFF....WAVEfmt '), html);
		expect(judge({ mime: 'audio/wav', ext: 'wav' }, 'not-utf8', wav, 'a.wav').ok).toBe(false);
		const pdf = concat(bytes('%PDF-1.7\n'), bytes('<!doctype html><p>hi'));
		expect(judge({ mime: 'application/pdf', ext: 'pdf' }, 'not-utf8', pdf, 'a.pdf').ok).toBe(false);
		// PDF dictionaries and XMP metadata are not web pages.
		const realPdf = bytes('%PDF-1.7\n<< /Type /Catalog >>\n<?xpacket begin="" id="W5M0"?><x:xmpmeta xmlns:x="adobe:ns:meta/">');
		expect(judge({ mime: 'application/pdf', ext: 'pdf' }, 'not-utf8', realPdf, 'a.pdf').ok).toBe(true);
	});

	it('takes plain UTF-8 text only as a .txt lyric sheet, and never markup or control bytes', () => {
		const lyrics = bytes('Verse 1\nI left my heart in the vocal booth\n');
		expect(judge(undefined, 'text', lyrics, 'lyrics.TXT')).toMatchObject({
			ok: true,
			type: { contentType: 'text/plain; charset=utf-8' }
		});
		expect(judge(undefined, 'text', lyrics, 'track.wav').ok).toBe(false);
		expect(judge(undefined, 'text', bytes('\uFEFF  <!DOCTYPE html><script>alert(1)</script>'), 'lyrics.txt').ok).toBe(false);
		expect(judge(undefined, 'text', bytes('<svg onload="x()"/>'), 'lyrics.txt').ok).toBe(false);
		expect(judge(undefined, 'not-utf8', bytes('whatever'), 'lyrics.txt').ok).toBe(false);
		expect(judge(undefined, 'control', lyrics, 'lyrics.txt').ok).toBe(false);
		expect(judge(undefined, 'markup', lyrics, 'lyrics.txt').ok).toBe(false);
	});

	it('follows UTF-8 across chunk boundaries and refuses NUL and other control bytes and broken sequences', () => {
		const run = (...chunks: Uint8Array[]) => {
			const check = new TextCheck();
			for (const c of chunks) check.push(c);
			return check.finish();
		};
		const text = bytes('Kesä — ääni\r\n\tchorus\f');
		expect(run(text.subarray(0, 4), text.subarray(4))).toBe('text'); // splits the two bytes of “ä”
		expect(run(bytes('a\u0000b'))).toBe('control');
		expect(run(bytes('line\u001b[31mred'))).toBe('control');
		expect(run(bytes('a\u0085b'))).toBe('control');
		expect(run(new Uint8Array([0x61, 0xc3]))).toBe('not-utf8');
		expect(run(new Uint8Array([0xff, 0xfe, 0x41]))).toBe('not-utf8');
	});

	it('finds markup anywhere in a text file, even split across chunks', () => {
		const verse = 'Verse 1\nI left my heart in the vocal booth\n'.repeat(100);
		expect(new TextCheck().finish()).toBe('text');
		const late = bytes(`${verse}<script>alert(1)</script>`);
		expect(
			(() => {
				const c = new TextCheck();
				c.push(late.subarray(0, late.length - 30));
				c.push(late.subarray(late.length - 30));
				return c.finish();
			})()
		).toBe('markup');
		const split = bytes(`${verse}<scr`);
		const c = new TextCheck();
		c.push(split);
		c.push(bytes('ipt src=x>'));
		expect(c.finish()).toBe('markup');
		// Angle brackets in lyrics are not markup.
		const heart = new TextCheck();
		heart.push(bytes('I <3 this take, 2 < 3 and <chorus> x2'));
		expect(heart.finish()).toBe('text');
	});
});

describe('names', () => {
	it('keeps only the last path part, without control or bidi-override characters', () => {
		expect(displayName('../../etc/passwd')).toBe('passwd');
		expect(displayName('C:\\Users\\me\\Demo.wav')).toBe('Demo.wav');
		expect(displayName('bad\u0000name\r\n.wav')).toBe('badname.wav');
		// U+202E would show “evil‮vaw.exe” as “evilexe.wav”.
		expect(displayName('evil\u202Evaw.exe')).toBe('evilvaw.exe');
		expect(displayName('   ')).toBe('upload');
		expect(displayName('..')).toBe('upload');
		const long = displayName('x'.repeat(500) + '.flac');
		expect(long).toHaveLength(200);
		expect(long.endsWith('.flac')).toBe(true);
	});

	it('gives a download the extension of its content', () => {
		expect(downloadName('Demo.wav', 'audio/wav')).toBe('Demo.wav');
		expect(downloadName('Demo', 'audio/flac')).toBe('Demo.flac');
		expect(downloadName('notes.wav', 'text/plain; charset=utf-8')).toBe('notes.wav.txt');
	});

	it('writes Content-Disposition with an ASCII fallback and the UTF-8 name (RFC 6266, RFC 8187)', () => {
		expect(attachmentDisposition('Kesä "demo";1.wav')).toBe(
			`attachment; filename="Kesa _demo__1.wav"; filename*=UTF-8''Kes%C3%A4%20%22demo%22%3B1.wav`
		);
		expect(attachmentDisposition("it's (live)*.mp3")).toContain("filename*=UTF-8''it%27s%20%28live%29%2A.mp3");
	});
});

describe('limits, in words a person reads', () => {
	it('lets a larger per-file limit raise the booking total to match', () => {
		expect(uploadLimits(String(300 * MIB)).maxTotalBytes).toBe(300 * MIB);
		expect(uploadLimits(undefined).maxFileBytes).toBe(52_428_800); // 50 × 2^20
		expect(uploadLimits(String(2 ** 53)).maxFileBytes).toBe(DEFAULT_MAX_FILE_BYTES); // not a safe integer
	});

	it('takes a file that exactly fills the booking, and says 0 B is left when it is over', () => {
		const lim = uploadLimits(String(50 * MIB));
		expect(quotaProblem({ files: 4, bytes: 180 * MIB }, lim, 20 * MIB)).toBeNull();
		expect(quotaProblem({ files: 4, bytes: 180 * MIB }, lim, 20 * MIB + 1)).toMatch(/; 20 MB is left\.$/);
		const over = { files: 1, bytes: 210 * MIB };
		expect(quotaProblem(over, lim, 1)).toBe('The files for a booking can add up to 200 MB; 0 B is left.');
		expect(roomForOneFile(over, lim)).toBe(0);
		expect(quotaProblem({ files: 11, bytes: 0 }, lim, 1)).toBe('A booking holds at most 10 files. Remove one to add another.');
		expect(quotaProblem({ files: 0, bytes: 0 }, lim, 60 * MIB)).toBe('A file can be at most 50 MB.');
	});

	it('writes sizes in B below 1 KiB, KB with one decimal below 10 KiB, whole KB below 1 MiB, then MB', () => {
		expect(formatBytes(0)).toBe('0 B');
		expect(formatBytes(1023)).toBe('1023 B');
		expect(formatBytes(1024)).toBe('1.0 KB');
		expect(formatBytes(1536)).toBe('1.5 KB');
		expect(formatBytes(10 * 1024 - 1)).toBe('10.0 KB'); // 9.999 KiB, still one decimal
		expect(formatBytes(10 * 1024)).toBe('10 KB');
		expect(formatBytes(MIB - 1)).toBe('1024 KB');
		expect(formatBytes(MIB)).toBe('1 MB');
		expect(formatBytes(1.5 * MIB)).toBe('1.5 MB');
		expect(formatBytes(200 * MIB)).toBe('200 MB');
	});
});

describe('every accepted type: its stored content type, label and download extension', () => {
	// mime reported by the sniffer -> [stored content type, label, extension added, another it keeps]
	const table: [string, string, string, string, string][] = [
		['audio/wav', 'audio/wav', 'WAV audio', 'wav', 'wave'],
		['audio/aiff', 'audio/aiff', 'AIFF audio', 'aif', 'aifc'],
		['audio/flac', 'audio/flac', 'FLAC audio', 'flac', 'flac'],
		['audio/ogg', 'audio/ogg', 'Ogg audio', 'ogg', 'oga'],
		['audio/ogg; codecs=opus', 'audio/ogg; codecs=opus', 'Opus audio', 'opus', 'ogg'],
		['audio/x-m4a', 'audio/mp4', 'M4A audio', 'm4a', 'mp4'],
		['audio/mp4', 'audio/mp4', 'M4A audio', 'm4a', 'mp4'],
		['application/pdf', 'application/pdf', 'PDF', 'pdf', 'pdf']
	];
	it.each(table)('%s', (mime, contentType, label, first, other) => {
		const verdict = judge({ mime, ext: first }, 'not-utf8', none, 'x');
		expect(verdict).toEqual({ ok: true, type: expect.objectContaining({ contentType, label }) as AcceptedType });
		expect(labelFor(contentType)).toBe(label);
		expect(downloadName('take', contentType)).toBe(`take.${first}`);
		expect(downloadName(`take.${other.toUpperCase()}`, contentType)).toBe(`take.${other.toUpperCase()}`);
		expect(downloadName('take.txt', contentType)).toBe(`take.txt.${first}`);
		// The file picker offers what the server takes.
		expect(ACCEPT_ATTRIBUTE.split(',')).toContain(`.${first}`);
	});

	it('labels MP3, AAC and text, and shows an unknown type as it is', () => {
		expect(labelFor('audio/mpeg')).toBe('MP3 audio');
		expect(labelFor('audio/aac')).toBe('AAC audio');
		expect(labelFor('text/plain; charset=utf-8')).toBe('Text');
		expect(labelFor('video/mp4')).toBe('video/mp4');
		expect(downloadName('take', 'audio/mpeg')).toBe('take.mp3');
		expect(downloadName('take', 'audio/aac')).toBe('take.aac');
		expect(downloadName('take', 'video/mp4')).toBe('take'); // nothing we serve
		expect(downloadName('.wav', 'audio/wav')).toBe('.wav.wav'); // a dot file has no extension
	});
});

describe('MPEG audio frame headers (ISO/IEC 11172-3, 13818-3)', () => {
	const len = (...header: number[]) => mpegFrameLength(new Uint8Array(header), 0);
	// Byte 1: 111 (sync) VV (version) LL (layer) P; byte 2: BBBB (bitrate) RR (rate) p (padding) x.
	it('Layer I: 4-byte slots, (12 × bitrate / rate + padding) × 4', () => {
		// MPEG-1 (VV=11) Layer I (LL=11): 0xFF; bitrate index 12 = 384 kbit/s, 44.1 kHz.
		expect(len(0xff, 0xff, 0xc0, 0)).toBe(416); // floor(12 × 384000 / 44100) = 104 slots
		expect(len(0xff, 0xff, 0xc2, 0)).toBe(420); // one padding slot of 4 bytes
		expect(len(0xff, 0xff, 0xc8, 0)).toBe(576); // 32 kHz: 144 slots
		expect(len(0xff, 0xff, 0x24, 0)).toBe(64); // index 2 = 64 kbit/s at 48 kHz: 16 slots
		// MPEG-2 (VV=10) Layer I: index 2 = 48 kbit/s at 24 kHz: 24 slots.
		expect(len(0xff, 0xf7, 0x24, 0)).toBe(96);
	});

	it('Layers II and III: 144 × bitrate / rate bytes, 72 for Layer III of MPEG-2 and 2.5', () => {
		// Bitrate index 2 at 48 kHz: Layer II has 48 kbit/s, Layer III 40 kbit/s (MPEG-1 tables).
		expect(len(0xff, 0xfd, 0x24, 0)).toBe(144);
		expect(len(0xff, 0xfb, 0x24, 0)).toBe(120);
		// MPEG-2 at 24 kHz, index 2 = 16 kbit/s: Layer II 144 × 16000 / 24000, Layer III half of it.
		expect(len(0xff, 0xf5, 0x24, 0)).toBe(96);
		expect(len(0xff, 0xf3, 0x24, 0)).toBe(48);
		// MPEG-2 Layer III, index 8 = 64 kbit/s at 22.05 kHz: floor(72 × 64000 / 22050) = 208.
		expect(len(0xff, 0xf3, 0x80, 0)).toBe(208);
		// MPEG-2.5 (VV=00) halves the rates again: 11.025 kHz, floor(72 × 64000 / 11025) = 417.
		expect(len(0xff, 0xe3, 0x80, 0)).toBe(417);
		expect(len(0xff, 0xe3, 0x88, 0)).toBe(576); // 8 kHz: 72 × 64000 / 8000
		expect(len(0xff, 0xf3, 0x84, 0)).toBe(192); // 24 kHz: 72 × 64000 / 24000
		expect(len(0xff, 0xf3, 0x88, 0)).toBe(288); // 16 kHz
	});

	it('refuses reserved versions, layers, bitrates and rates, a broken sync and a cut header', () => {
		expect(len(0xff, 0xeb, 0x90, 0)).toBe(0); // version 01 is reserved
		expect(len(0xff, 0xf9, 0x90, 0)).toBe(0); // layer 00 is reserved
		expect(len(0xff, 0xfb, 0x00, 0)).toBe(0); // bitrate index 0: free format, no length
		expect(len(0xff, 0xfb, 0x02, 0)).toBe(0); // even with the padding bit
		expect(len(0xff, 0xdb, 0x90, 0)).toBe(0); // only two of the three high sync bits
		expect(len(0xfe, 0xfb, 0x90, 0)).toBe(0);
		expect(len(0xff, 0xfb, 0x90)).toBe(0);
		expect(mpegFrameLength(new Uint8Array([0, 0, 0xff, 0xfb, 0x90, 0x64]), 2)).toBe(417);
		expect(mpegFrameLength(new Uint8Array([0, 0, 0xff, 0xfb, 0x90]), 2)).toBe(0);
	});

	it('finds the first frame only within the first 4 KiB, and needs four in a row', () => {
		expect(hasFrameChain(mp3Frames(4), 'mpeg')).toBe(true);
		expect(hasFrameChain(concat(new Uint8Array(4095), mp3Frames(4)), 'mpeg')).toBe(true);
		expect(hasFrameChain(concat(new Uint8Array(4096), mp3Frames(4)), 'mpeg')).toBe(false);
		const broken = mp3Frames(6);
		broken[417 * 2] = 0; // the third header is gone: two, then three more
		expect(hasFrameChain(broken, 'mpeg')).toBe(false);
		expect(hasFrameChain(none, 'mpeg')).toBe(false);
	});

	it('reads enough to follow four of the longest frames past the search', () => {
		// The longest MPEG frame: MPEG-2.5 Layer II at 160 kbit/s and 8 kHz, 144 × 160000 / 8000 + 1.
		expect(mpegFrameLength(new Uint8Array([0xff, 0xe5, 0xea, 0]), 0)).toBe(2881);
		expect(PROBE_BYTES).toBeGreaterThanOrEqual(4096 + 4 * 2881);
	});
});

/** An ADTS header (ISO/IEC 13818-7 §6.2): AAC LC, 44.1 kHz, stereo, a frame of `length` bytes. */
function adtsHeader(length: number, crc = false): number[] {
	return [0xff, crc ? 0xf0 : 0xf1, 0x50, 0x80 | (length >> 11), (length >> 3) & 0xff, ((length & 7) << 5) | 0x1f, 0xfc];
}
function adtsFrames(count: number, length = 371): Uint8Array {
	const out = new Uint8Array(length * count);
	for (let i = 0; i < count; i++) out.set(adtsHeader(length), i * length);
	return out;
}
const AAC = { mime: 'audio/aac', ext: 'aac' };

describe('ADTS (AAC) frame headers (ISO/IEC 13818-7)', () => {
	const len = (...header: number[]) => adtsFrameLength(new Uint8Array(header), 0);
	it('reads the 13-bit frame length across bytes 3 to 5', () => {
		expect(len(0xff, 0xf1, 0x50, 0x80, 0x2e, 0x7f, 0xfc)).toBe(371); // 0x2e << 3 | 3
		expect(len(0xff, 0xf1, 0x50, 0x83, 0x00, 0x1f, 0xfc)).toBe(6144); // the two high bits: 3 << 11
		expect(len(0xff, 0xf1, 0x50, 0x80, 0x00, 0xff, 0xfc)).toBe(0); // length 7: no room for data
		expect(len(0xff, 0xf1, 0x50, 0x80, 0x01, 0x1f, 0xfc)).toBe(8);
		expect(len(0xff, 0xf9, 0x50, 0x80, 0x2e, 0x7f, 0xfc)).toBe(371); // ID 1 (MPEG-2) too
		expect(adtsFrameLength(new Uint8Array([9, 9, ...adtsHeader(371)]), 2)).toBe(371);
	});

	it('with a CRC the header is 9 bytes, so a frame must be longer than that', () => {
		expect(len(...adtsHeader(9, true))).toBe(0);
		expect(len(...adtsHeader(10, true))).toBe(10);
		expect(len(...adtsHeader(8, false))).toBe(8);
	});

	it('refuses a layer other than 0, a reserved sampling rate, a broken sync and a cut header', () => {
		expect(len(0xff, 0xf3, 0x50, 0x80, 0x2e, 0x7f, 0xfc)).toBe(0); // layer 01
		expect(len(0xff, 0xf5, 0x50, 0x80, 0x2e, 0x7f, 0xfc)).toBe(0); // layer 10
		expect(len(0xff, 0xe1, 0x50, 0x80, 0x2e, 0x7f, 0xfc)).toBe(0); // sync bit missing
		expect(len(0xfe, 0xf1, 0x50, 0x80, 0x2e, 0x7f, 0xfc)).toBe(0);
		expect(len(0xff, 0xf1, 0x70, 0x80, 0x2e, 0x7f, 0xfc)).toBe(371); // index 12: 7350 Hz
		expect(len(0xff, 0xf1, 0x74, 0x80, 0x2e, 0x7f, 0xfc)).toBe(0); // index 13 is reserved
		expect(len(0xff, 0xf1, 0x7c, 0x80, 0x2e, 0x7f, 0xfc)).toBe(0); // index 15
		expect(len(0xff, 0xf1, 0x50, 0x80, 0x2e, 0x7f)).toBe(0);
	});

	it('takes AAC only as a chain of ADTS frames, not MPEG ones', () => {
		expect(hasFrameChain(adtsFrames(4), 'adts')).toBe(true);
		expect(hasFrameChain(adtsFrames(3), 'adts')).toBe(false);
		expect(judge(AAC, 'not-utf8', adtsFrames(5), 'a.aac')).toMatchObject({ ok: true, type: { contentType: 'audio/aac' } });
		const verdict = judge(AAC, 'not-utf8', mp3Frames(6), 'a.aac');
		expect(verdict).toEqual({
			ok: false,
			message:
				'“a.aac” is not AAC audio: it only starts like it. This booking takes audio (WAV, AIFF, FLAC, MP3, Ogg/Opus, M4A/AAC), PDF, or a plain-text lyric sheet (.txt).'
		});
		// The probe, where the audio starts, is what is followed, not the head.
		expect(judge(AAC, 'not-utf8', none, 'a.aac', adtsFrames(5)).ok).toBe(true);
		expect(judge(MP3, 'not-utf8', mp3Frames(6), 'a.mp3', none).ok).toBe(false);
		// Formats with a strong signature need no frame chain.
		expect(judge({ mime: 'audio/flac', ext: 'flac' }, 'not-utf8', bytes('fLaC'), 'a.flac').ok).toBe(true);
	});
});

describe('ID3v2 tags before the audio (ID3v2.4 §3.1)', () => {
	it('skips each tag by its synchsafe size, plus a 10-byte footer when its flag says so', () => {
		// Size bytes 1, 2, 3, 4 of seven bits each: 1·2^21 + 2·2^14 + 3·2^7 + 4.
		expect(audioStart(new Uint8Array([0x49, 0x44, 0x33, 4, 0, 0, 1, 2, 3, 4]))).toBe(10 + 2_130_308);
		expect(audioStart(new Uint8Array([0x49, 0x44, 0x33, 4, 0, 0, 0, 0, 0, 0]))).toBe(10);
		const footer = id3(100);
		footer[5] = 0x10;
		expect(audioStart(concat(footer, new Uint8Array(10)))).toBe(120);
		const other = id3(100);
		other[5] = 0x80; // unsynchronisation: no footer
		expect(audioStart(other)).toBe(110);
		expect(audioStart(concat(id3(50), id3(30), mp3Frames(1)))).toBe(100);
	});

	it('finds no tag without “ID3” and a whole 10-byte header', () => {
		expect(audioStart(mp3Frames(2))).toBe(0);
		expect(audioStart(bytes('ID4\u0004\u0000\u0000\u0000\u0000\u0000\u0010'))).toBe(0);
		expect(audioStart(bytes('IE3\u0004\u0000\u0000\u0000\u0000\u0000\u0010'))).toBe(0);
		expect(audioStart(bytes('JD3\u0004\u0000\u0000\u0000\u0000\u0000\u0010'))).toBe(0);
		expect(audioStart(id3(20).subarray(0, 9))).toBe(0);
	});
});

describe('web markup in uploads', () => {
	const wav = { mime: 'audio/wav', ext: 'wav' };
	const riff = (tail: string) => concat(bytes('RIFF....WAVEfmt '), new Uint8Array([0, 0x80, 0xff]), bytes(tail));
	it('refuses audio that holds the start of a page or a script', () => {
		for (const page of [
			'<!DOCTYPE  html>',
			'<html>',
			'<HTML lang=en>',
			'<head>',
			'<body\n>',
			'<script>',
			'<iframe src=x>',
			'<svg>',
			'<object>',
			'<embed>'
		]) {
			const verdict = judge(wav, 'not-utf8', riff(page), 'a.wav');
			expect(verdict, page).toMatchObject({
				ok: false,
				message: expect.stringContaining('a web page behind a WAV audio header') as string
			});
		}
	});

	it('takes audio whose bytes only happen to look like a bracket and a word', () => {
		for (const text of [
			'<htmlx',
			'<!doctype xml>',
			'<bodyguard',
			'<scripted',
			'<svgz',
			'<b>',
			'< html>',
			'<header',
			'<objects',
			'<embedded'
		]) {
			expect(judge(wav, 'not-utf8', riff(text), 'a.wav').ok, text).toBe(true);
		}
	});

	it('refuses a text file that starts as markup of any kind, after a BOM and spaces', () => {
		for (const start of ['<p>hi', '<?php echo 1;', '</div>', '<!-- x -->', '\uFEFF\n  <a href=x>', '<Z>']) {
			const verdict = judge(undefined, 'text', bytes(start), 'lyrics.txt');
			expect(verdict, start).toMatchObject({ ok: false, message: expect.stringContaining('a web page or markup') as string });
		}
		for (const start of ['< 3 times', '<3', 'x <p>', '\uFEFFVerse']) {
			expect(judge(undefined, 'text', bytes(start), 'lyrics.txt').ok, start).toBe(true);
		}
		// A character cut by the end of that first KiB is no reason to refuse.
		expect(judge(undefined, 'text', bytes('a'.repeat(1023) + 'ä'), 'lyrics.txt').ok).toBe(true);
		// Only the first KiB decides the start; the text check looks at the rest.
		expect(judge(undefined, 'text', bytes(' '.repeat(1024) + '<p>'), 'lyrics.txt').ok).toBe(true);
	});

	it('says why text is refused', () => {
		const msg = (text: TextFinding, name = 'l.txt') => {
			const v = judge(undefined, text, bytes('la la'), name);
			return v.ok ? '' : v.message;
		};
		expect(msg('not-utf8')).toMatch(/^“l.txt” is not a kind of file we recognise\. This booking takes audio/);
		expect(msg('control')).toMatch(/^“l.txt” is not plain text: it holds control characters\./);
		expect(msg('markup')).toMatch(/^“l.txt” is a web page or markup, not a plain-text lyric sheet\./);
		expect(msg('text', 'l.doc')).toMatch(/^“l.doc” is plain text; name it .txt if it is a lyric sheet\./);
		expect(msg('text', '.txt')).toMatch(/name it .txt/); // a dot file has no extension
	});

	it('finds every page-making tag in text, with spaces and a slash inside the bracket', () => {
		const tags = [
			'< script >',
			'</ html>',
			'<!DOCTYPE x>',
			'<head>',
			'<body>',
			'<iframe>',
			'<frame>',
			'<frameset>',
			'<object>',
			'<embed>'
		];
		tags.push(
			'<svg/>',
			'<math>',
			'<style>',
			'<link rel=x>',
			'<meta x>',
			'<base href=x>',
			'<form>',
			'<img src=x>',
			'<?xml version="1.0"?>'
		);
		for (const tag of tags) {
			const check = new TextCheck();
			check.push(bytes(`Chorus x2 ${tag} end`));
			expect(check.finish(), tag).toBe('markup');
		}
		for (const text of ['<scripture>', '<bodies>', '<b>bold</b>', '< >', '<htm', 'I <3 head banging']) {
			const check = new TextCheck();
			check.push(bytes(`Chorus ${text} end`));
			expect(check.finish(), text).toBe('text');
		}
	});
});

describe('the text check, byte by byte', () => {
	const run = (...chunks: (string | Uint8Array)[]) => {
		const check = new TextCheck();
		for (const c of chunks) check.push(typeof c === 'string' ? bytes(c) : c);
		return check.finish();
	};
	it('takes tab, line feed, form feed, carriage return and no-break space as text, other C0 and C1 controls not', () => {
		expect(run('a\tb\nc\fd\re\u00a0f\u00ffg')).toBe('text');
		for (const c of ['\u0001', '\u0008', '\u000b', '\u000e', '\u001f', '\u007f', '\u0080', '\u009f']) {
			expect(run(`a${c}b`), c.charCodeAt(0).toString(16)).toBe('control');
		}
	});

	it('keeps its first finding', () => {
		expect(run('a\u0000', '<script>')).toBe('control');
		expect(run('<script>', 'a\u0000')).toBe('markup');
		expect(run(new Uint8Array([0xff]), 'plain')).toBe('not-utf8');
		expect(run(new Uint8Array([0xff]), '<script>', 'a\u0000')).toBe('not-utf8');
		expect(run('ok', new Uint8Array([0xe2, 0x82]))).toBe('not-utf8'); // cut at the end
	});

	it('sees a tag split anywhere in the last 32 characters of a chunk', () => {
		expect(run('x'.repeat(100) + '<!doctype', ' html>')).toBe('markup');
		expect(run('x'.repeat(100) + '<', 'script>')).toBe('markup');
		expect(run('la <scr', 'ipt>')).toBe('markup');
		expect(run('x'.repeat(100) + '<', ' '.repeat(20), 'script>')).toBe('markup');
	});
});

describe('display names and downloads', () => {
	it('collapses white space, drops bidi marks and C1 controls, and composes accents (NFC)', () => {
		expect(displayName('  my \t  take\u00a0 .wav ')).toBe('my take .wav');
		expect(displayName('a\u200eb\u200fc\u202ad\u202ce\u2066f\u2069g\u0085h\u009fi\u007fj.wav')).toBe('abcdefghij.wav');
		expect(displayName('Cafe\u0301.wav')).toBe('Caf\u00e9.wav');
		expect(displayName('Cafe\u0301.wav')).toHaveLength(8);
		expect(displayName(null)).toBe('upload');
		expect(displayName(undefined)).toBe('upload');
		expect(displayName('.')).toBe('upload');
		expect(displayName('dir/')).toBe('upload');
		expect(displayName('a\u2067b')).toBe('ab');
	});

	it('cuts a long name to 200 characters, keeping an extension shorter than 10 characters', () => {
		expect(displayName('x'.repeat(500))).toBe('x'.repeat(200));
		expect(displayName('x'.repeat(200))).toBe('x'.repeat(200));
		expect(displayName('x'.repeat(500) + '.abcdefghi')).toBe('x'.repeat(190) + '.abcdefghi');
		expect(displayName('x'.repeat(500) + '.abcdefghij')).toBe('x'.repeat(200));
		expect(displayName('y'.repeat(196) + '.flac')).toBe('y'.repeat(195) + '.flac'); // 201: one y goes
		expect(displayName('y'.repeat(196) + '.flac')).toHaveLength(200);
	});

	it('replaces in the ASCII fallback what is not printable ASCII, quotes, backslash, percent and semicolon', () => {
		expect(attachmentDisposition('a\\b%c;d"e\u007f日.wav')).toBe(
			`attachment; filename="a_b_c_d_e__.wav"; filename*=UTF-8''a%5Cb%25c%3Bd%22e%7F%E6%97%A5.wav`
		);
		// NFKD splits the ligature ﬁ into f and i and é into e and an accent, which is dropped.
		expect(attachmentDisposition('\ufb01n\u00e9 ~!.mp3')).toBe(
			`attachment; filename="fine ~!.mp3"; filename*=UTF-8''%EF%AC%81n%C3%A9%20~!.mp3`
		);
	});
});
