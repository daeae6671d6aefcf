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
	Utf8TextCheck
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

describe('the type of a file comes from its content (ASVS 5.2.2)', () => {
	it('takes the audio and PDF signatures it knows, whatever the name', () => {
		const wav = judgeContent({ mime: 'audio/wav', ext: 'wav' }, false, new Uint8Array(), 'take 3.pdf');
		expect(wav).toMatchObject({ ok: true, type: { contentType: 'audio/wav' } });
		expect(judgeContent({ mime: 'audio/x-m4a', ext: 'm4a' }, false, new Uint8Array(), 'x')).toMatchObject({
			ok: true,
			type: { contentType: 'audio/mp4' }
		});
		expect(judgeContent({ mime: 'application/pdf', ext: 'pdf' }, false, new Uint8Array(), 'x')).toMatchObject({ ok: true });
	});

	it('refuses other signatures, naming what the file really is', () => {
		const exe = judgeContent({ mime: 'application/x-msdownload', ext: 'exe' }, false, new Uint8Array(), 'track.wav');
		expect(exe.ok).toBe(false);
		if (!exe.ok) expect(exe.message).toMatch(/“track.wav” is EXE data/);
		expect(judgeContent({ mime: 'video/mp4', ext: 'mp4' }, false, new Uint8Array(), 'a.m4a').ok).toBe(false);
	});

	it('takes plain UTF-8 text only as a .txt lyric sheet, and never markup', () => {
		const lyrics = bytes('Verse 1\nI left my heart in the vocal booth\n');
		expect(judgeContent(undefined, true, lyrics, 'lyrics.TXT')).toMatchObject({
			ok: true,
			type: { contentType: 'text/plain; charset=utf-8' }
		});
		expect(judgeContent(undefined, true, lyrics, 'track.wav').ok).toBe(false);
		expect(judgeContent(undefined, true, bytes('\uFEFF  <!DOCTYPE html><script>alert(1)</script>'), 'lyrics.txt').ok).toBe(false);
		expect(judgeContent(undefined, true, bytes('<svg onload="x()"/>'), 'lyrics.txt').ok).toBe(false);
		expect(judgeContent(undefined, false, bytes('whatever'), 'lyrics.txt').ok).toBe(false);
	});

	it('follows UTF-8 across chunk boundaries and refuses NUL bytes and broken sequences', () => {
		const ok = new Utf8TextCheck();
		const text = bytes('Kesä — ääni');
		ok.push(text.subarray(0, 4)); // splits the two bytes of “ä”
		ok.push(text.subarray(4));
		expect(ok.finish()).toBe(true);
		const nul = new Utf8TextCheck();
		nul.push(bytes('a\u0000b'));
		expect(nul.finish()).toBe(false);
		const broken = new Utf8TextCheck();
		broken.push(new Uint8Array([0x61, 0xc3]));
		expect(broken.finish()).toBe(false);
		const invalid = new Utf8TextCheck();
		invalid.push(new Uint8Array([0xff, 0xfe, 0x41]));
		expect(invalid.finish()).toBe(false);
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
