// Small audio files for the upload specs, built byte by byte.
// WAV: the canonical 44-byte RIFF/WAVE header of 16-bit PCM (Microsoft's RIFF "WAVE" format, the
// "fmt " and "data" chunks). MP3: MPEG-1 Layer III frames (ISO/IEC 11172-3), each a 4-byte header.

/** A mono 16-bit 8 kHz PCM WAV: the header, then `samples` of a 440 Hz sine; `padTo` pads the data with silence to that many bytes in all. */
export function wav(samples = 400, padTo?: number): Uint8Array<ArrayBuffer> {
	const dataBytes = padTo ? padTo - 44 : samples * 2;
	const buf = Buffer.alloc(44 + dataBytes);
	buf.write('RIFF', 0, 'ascii');
	buf.writeUInt32LE(36 + dataBytes, 4);
	buf.write('WAVE', 8, 'ascii');
	buf.write('fmt ', 12, 'ascii');
	buf.writeUInt32LE(16, 16); // fmt chunk size
	buf.writeUInt16LE(1, 20); // PCM
	buf.writeUInt16LE(1, 22); // channels
	buf.writeUInt32LE(8000, 24); // sample rate
	buf.writeUInt32LE(8000 * 2, 28); // byte rate
	buf.writeUInt16LE(2, 32); // block align
	buf.writeUInt16LE(16, 34); // bits per sample
	buf.write('data', 36, 'ascii');
	buf.writeUInt32LE(dataBytes, 40);
	for (let i = 0; i < Math.min(samples, dataBytes / 2); i++)
		buf.writeInt16LE(Math.round(8000 * Math.sin((2 * Math.PI * 440 * i) / 8000)), 44 + i * 2);
	return new Uint8Array(buf);
}

/** An MPEG-1 Layer III frame header: sync, no CRC, 128 kbit/s, 44.1 kHz, no padding, joint stereo. */
export const MP3_FRAME_HEADER = [0xff, 0xfb, 0x90, 0x64] as const;

/** Bytes of one such frame: 144 × 128000 / 44100, rounded down. */
export const MP3_FRAME_BYTES = 417;

/** `count` MP3 frames one after another (headers over silent frames): what a real MP3 file looks like. */
export function mp3Frames(count: number): Uint8Array<ArrayBuffer> {
	const frames = new Uint8Array(MP3_FRAME_BYTES * count);
	for (let i = 0; i < count; i++) frames.set(MP3_FRAME_HEADER, i * MP3_FRAME_BYTES);
	return frames;
}

/** One MP3 frame header in front of other bytes: a file that only starts like audio. */
export function behindMp3Header(rest: Uint8Array): Uint8Array<ArrayBuffer> {
	const bytes = new Uint8Array(MP3_FRAME_HEADER.length + rest.length);
	bytes.set(MP3_FRAME_HEADER);
	bytes.set(rest, MP3_FRAME_HEADER.length);
	return bytes;
}
