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
	TextCheck,
	audioStart,
	hasFrameChain,
	mpegFrameLength,
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
