// The artist's uploads over real HTTP against the production build, its database and its upload
// folder. Checked against OWASP ASVS 5.0: 5.2.1 (size limits, 413), 5.2.2 (type from the content,
// 415), 5.3.2 (server-chosen paths), and object-level access (8.2.2: another artist gets 404).
import { createHash } from 'node:crypto';
import { readdir, readFile } from 'node:fs/promises';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { Client, signedIn } from '../support/http';
import { DEMO } from '../support/env';
import { testDb } from '../support/db';
import { waitFor } from '../support/wait';
import { workdaysAhead } from '../support/dates';
import { holdFirstFree, payAndConfirm } from '../support/booking';
import { behindMp3Header, mp3Frames, wav } from '../support/audio';
import { expectRefused } from '../support/refusal';
import * as t from '../../src/lib/server/db/schema';

const { db, client } = testDb();
afterAll(() => client.end());

// scripts/test.sh sets both; the defaults are the same values.
const UPLOAD_DIR = process.env.UPLOAD_DIR ?? path.resolve('.data/test-uploads');
const MAX_FILE = Number(process.env.UPLOAD_MAX_BYTES ?? 4 * 1024 * 1024);
const BODY_LIMIT = Number(process.env.BODY_SIZE_LIMIT ?? MAX_FILE + 1024 * 1024);

const sha256 = (b: Uint8Array) => createHash('sha256').update(b).digest('hex');

function upload(who: Client, bookingId: string, bytes: Uint8Array<ArrayBuffer>, name: string, type = 'audio/wav') {
	const form = new FormData();
	form.set('file', new Blob([bytes], { type }), name);
	return who.fetch(`/api/bookings/${bookingId}/uploads`, { method: 'POST', body: form });
}

/** This file's days: working weekdays from 150 days ahead, and two-hour slots on each. */
const DAYS = workdaysAhead(150, 15);
const SLOTS: [string, string][] = [
	['09:00', '11:00'],
	['11:30', '13:30'],
	['14:00', '16:00']
];

/** Two hours in the vocal booth on the first free slot of this file's days. */
const book = (who: Client) => holdFirstFree(who, { room: 'vocal-booth', days: DAYS, slots: SLOTS });

/** Every file in the booking's folder, and the storage keys its rows name: the two must agree. */
async function onDisk(bookingId: string) {
	const files = (await readdir(path.join(UPLOAD_DIR, bookingId)).catch(() => [] as string[]))
		.map((f) => `${bookingId}/${f}`)
		.sort();
	const rows = await db.select({ key: t.upload.storageKey }).from(t.upload).where(eq(t.upload.bookingId, bookingId));
	return { files, keys: rows.map((r) => r.key).sort() };
}

interface UploadJson {
	id: string;
	name: string;
	contentType: string;
	type: string;
	sizeBytes: number;
	sha256: string;
	createdAt: string;
	downloadUrl: string;
}

let artist: Client;
let artist2: Client;
let engineer: Client;
let owner: Client;
let accountant: Client;
const track = wav();

beforeAll(async () => {
	[artist, artist2, engineer, owner, accountant] = await Promise.all([
		signedIn(DEMO.artist),
		signedIn(DEMO.artist2),
		signedIn(DEMO.engineer),
		signedIn(DEMO.owner),
		signedIn(DEMO.accountant)
	]);
});

const TRACK_NAME = 'Guide vocal, Kesäyö (take 3).wav';

/** Each test's own booking, with the artist's guide vocal already on it: nothing is shared between tests. */
async function bookingWithTrack() {
	const booking = await book(artist);
	const res = await upload(artist, booking.id, track, TRACK_NAME);
	const stored = (await res.json()) as UploadJson;
	expect(res.status, JSON.stringify(stored)).toBe(201);
	return { booking, stored };
}

describe('uploading to a booking', () => {
	it('takes a small WAV from the booking’s artist, stores it under a server-chosen name, and lists it', async () => {
		const booking = await book(artist);
		const res = await upload(artist, booking.id, track, TRACK_NAME);
		const body = (await res.json()) as UploadJson;
		expect(res.status, JSON.stringify(body)).toBe(201);
		expect(body).toMatchObject({
			name: 'Guide vocal, Kesäyö (take 3).wav',
			contentType: 'audio/wav',
			type: 'WAV audio',
			sizeBytes: track.length,
			sha256: sha256(track)
		});
		expect(body.downloadUrl).toBe(`/uploads/${body.id}`);

		const [row] = await db.select().from(t.upload).where(eq(t.upload.id, body.id));
		expect(row!.storageKey).toMatch(new RegExp(`^${booking.id}/[0-9a-f-]{36}$`));
		expect(row!.storageKey).not.toContain('Guide');
		expect(sha256(await readFile(path.join(UPLOAD_DIR, row!.storageKey)))).toBe(sha256(track));

		const list = await artist.fetch(`/api/bookings/${booking.id}/uploads`);
		expect(list.status).toBe(200);
		const listed = (await list.json()) as { uploads: UploadJson[]; usage: { files: number; bytes: number } };
		expect(listed.uploads.map((u) => u.id)).toEqual([body.id]);
		expect(listed.usage).toEqual({ files: 1, bytes: track.length });
	});

	it('lets the engineer list and download the same bytes, as an attachment that is never sniffed', async () => {
		const { booking, stored } = await bookingWithTrack();
		const list = (await (await engineer.fetch(`/api/bookings/${booking.id}/uploads`)).json()) as { uploads: UploadJson[] };
		expect(list.uploads.map((u) => u.id)).toContain(stored.id);
		const res = await engineer.fetch(stored.downloadUrl);
		expect(res.status).toBe(200);
		expect(res.headers.get('content-type')).toBe('audio/wav');
		expect(res.headers.get('x-content-type-options')).toBe('nosniff');
		expect(res.headers.get('cache-control')).toMatch(/private/);
		expect(res.headers.get('content-disposition')).toBe(
			`attachment; filename="Guide vocal, Kesayo (take 3).wav"; filename*=UTF-8''Guide%20vocal%2C%20Kes%C3%A4y%C3%B6%20%28take%203%29.wav`
		);
		expect(sha256(new Uint8Array(await res.arrayBuffer()))).toBe(sha256(track));
		expect((await owner.fetch(stored.downloadUrl)).status).toBe(200);
	});

	it('shows the files in the engineer’s day plan once the booking is confirmed', async () => {
		const { booking, stored } = await bookingWithTrack();
		await payAndConfirm(db, booking);
		const res = await engineer.fetch(`/api/studios/hollow-pine/plan?date=${booking.day}`);
		const plan = (await res.json()) as {
			rooms: { sessions: { id: string; uploads: { id: string; name: string; href: string }[] }[] }[];
		};
		const session = plan.rooms.flatMap((r) => r.sessions).find((s) => s.id === booking.id);
		expect(session?.uploads).toEqual([
			expect.objectContaining({ id: stored.id, name: 'Guide vocal, Kesäyö (take 3).wav', href: stored.downloadUrl })
		]);
	});

	it('answers another artist 404 for the list, an upload, a download and a removal, as for no booking at all', async () => {
		const { booking, stored } = await bookingWithTrack();
		// Nothing of the file in the answer: not its name, its id or its digest.
		const secrets = [stored.id, 'Guide vocal', stored.sha256];
		await expectRefused(await artist2.fetch(`/api/bookings/${booking.id}/uploads`), 404, { secrets });
		await expectRefused(await upload(artist2, booking.id, wav(), 'mine.wav'), 404, { secrets });
		await expectRefused(await artist2.fetch(stored.downloadUrl), 404, { secrets });
		await expectRefused(await artist2.fetch(`/api/bookings/${booking.id}/uploads/${stored.id}`, { method: 'DELETE' }), 404, {
			secrets
		});
		await expectRefused(await artist.fetch(`/api/bookings/00000000-0000-4000-8000-000000000000/uploads`), 404);
		expect((await onDisk(booking.id)).keys).toHaveLength(1);
	});

	it('answers the accountant 403, an engineer 403 for changes, and a stranger 401', async () => {
		const { booking, stored } = await bookingWithTrack();
		const secrets = [stored.id, 'Guide vocal', stored.sha256];
		await expectRefused(await accountant.fetch(`/api/bookings/${booking.id}/uploads`), 403, { secrets });
		await expectRefused(await upload(accountant, booking.id, wav(), 'a.wav'), 403, { secrets });
		await expectRefused(await accountant.fetch(stored.downloadUrl), 403, { secrets });
		await expectRefused(await upload(engineer, booking.id, wav(), 'e.wav'), 403, { secrets });
		await expectRefused(await engineer.fetch(`/api/bookings/${booking.id}/uploads/${stored.id}`, { method: 'DELETE' }), 403, {
			secrets
		});
		await expectRefused(await new Client().fetch(`/api/bookings/${booking.id}/uploads`), 401, { secrets });
		await expectRefused(await upload(new Client(), booking.id, wav(), 's.wav'), 401, { secrets });
		// Nothing was added or removed by any of them.
		const disk = await onDisk(booking.id);
		expect(disk.keys).toHaveLength(1);
		expect(disk.files).toEqual(disk.keys);
	});

	it('decides the type from the content: HTML or a Windows program named track.wav is refused with 415', async () => {
		const { booking } = await bookingWithTrack();
		const html = new TextEncoder().encode('<!doctype html><html><body><script>alert(document.cookie)</script></body></html>');
		const mz = new Uint8Array(512);
		mz.set([0x4d, 0x5a, 0x90, 0x00, 0x03]);
		for (const bytes of [html, mz]) {
			const res = await upload(artist, booking.id, bytes, 'track.wav', 'audio/wav');
			const body = (await res.json()) as { error: string; message: string };
			expect(res.status, JSON.stringify(body)).toBe(415);
			expect(body.error).toBe('unsupported_type');
			expect(body.message).toContain('track.wav');
		}
		// The same HTML under a .txt name is markup, not a lyric sheet.
		expect((await upload(artist, booking.id, html, 'lyrics.txt', 'text/plain')).status).toBe(415);
		const disk = await onDisk(booking.id);
		expect(disk.files).toEqual(disk.keys);
		expect(disk.keys).toHaveLength(1);
	});

	it('takes a plain UTF-8 lyric sheet and serves it as text', async () => {
		const booking = await book(artist);
		const lyrics = new TextEncoder().encode('Säkeistö 1\nThe tape hiss sings along\n');
		const res = await upload(artist, booking.id, lyrics, 'lyrics.txt', 'application/octet-stream');
		const body = (await res.json()) as UploadJson;
		expect(res.status, JSON.stringify(body)).toBe(201);
		expect(body.contentType).toBe('text/plain; charset=utf-8');
		const got = await engineer.fetch(body.downloadUrl);
		expect(new TextDecoder().decode(await got.arrayBuffer())).toBe('Säkeistö 1\nThe tape hiss sings along\n');
	});

	it('checks a file throughout: an MP3 frame header in front of a web page, or a lyric sheet with a script or control bytes, is refused', async () => {
		const booking = await book(artist);
		const page = new TextEncoder().encode(
			'<!doctype html><html><body><script>fetch("/api/bookings").then((r) => r.text()).then(alert)</script></body></html>\n'.repeat(
				40
			)
		);
		// One MPEG-1 Layer III frame header (128 kbit/s, 44.1 kHz), then the page.
		const disguised = behindMp3Header(page);
		const lyrics = (text: string) => new TextEncoder().encode(text);
		for (const [bytes, name] of [
			[disguised, 'take.mp3'],
			[lyrics('Verse 1\nThe tape hiss sings along\n<script>alert(1)</script>\n'), 'lyrics.txt'],
			[lyrics('Verse 1\u0000\u0001 hidden\n'), 'lyrics.txt'],
			[lyrics('Verse 1 \u001b[2J cleared\n'), 'lyrics.txt']
		] as const) {
			const res = await upload(artist, booking.id, bytes, name, 'audio/mpeg');
			const body = (await res.json()) as { error: string };
			expect(res.status, `${name}: ${JSON.stringify(body)}`).toBe(415);
			expect(body.error).toBe('unsupported_type');
		}
		// Real MP3 audio, frame after frame, is still taken.
		const frames = mp3Frames(8);
		const other = await book(artist);
		const ok = await upload(artist, other.id, frames, 'take.mp3', 'audio/mpeg');
		expect(ok.status, await ok.clone().text()).toBe(201);
		expect(((await ok.json()) as UploadJson).contentType).toBe('audio/mpeg');
		// Nothing of the refused files was kept.
		expect((await onDisk(booking.id)).files).toEqual([]);
		const disk = await onDisk(other.id);
		expect(disk.files).toEqual(disk.keys);
	});

	it('answers 413 for a file just over UPLOAD_MAX_BYTES and for a body over BODY_SIZE_LIMIT, leaving nothing behind', async () => {
		const booking = await book(artist);
		const before = await onDisk(booking.id);
		const over = await upload(artist, booking.id, wav(100, MAX_FILE + 1), 'too-long.wav');
		const body = (await over.json()) as { error: string; message: string };
		expect(over.status, JSON.stringify(body)).toBe(413);
		expect(body.error).toBe('too_large');
		expect(body.message).toMatch(/at most/);

		const huge = await upload(artist, booking.id, wav(100, BODY_LIMIT + 64 * 1024), 'huge.wav');
		expect(huge.status).toBe(413);
		expect(await huge.json()).toMatchObject({ error: 'too_large' });

		// Whatever part of the refused bodies reached the disk is removed: wait for the folder to
		// match what was there before, then say what it holds.
		const after = await waitFor(async () => {
			const now = await onDisk(booking.id);
			return JSON.stringify(now) === JSON.stringify(before) ? now : undefined;
		}, 'the refused uploads gone from the disk').catch(() => onDisk(booking.id));
		expect(after).toEqual(before);
		// The connection pool is still healthy afterwards.
		expect((await artist.fetch(`/api/bookings/${booking.id}/uploads`)).status).toBe(200);
	});

	it('answers 415 for a body that is not multipart, and 422 without a file', async () => {
		const booking = await book(artist);
		const json = await artist.json(`/api/bookings/${booking.id}/uploads`, { file: 'x' });
		expect(json.status).toBe(415);
		const form = new FormData();
		form.set('note', 'no file here');
		const empty = await artist.fetch(`/api/bookings/${booking.id}/uploads`, { method: 'POST', body: form });
		expect(empty.status).toBe(422);
		expect(await empty.json()).toMatchObject({ error: 'no_file' });
	});

	it('removes a file: the row and the bytes', async () => {
		const { booking, stored } = await bookingWithTrack();
		const [row] = await db.select().from(t.upload).where(eq(t.upload.id, stored.id));
		const res = await artist.fetch(`/api/bookings/${booking.id}/uploads/${stored.id}`, { method: 'DELETE' });
		expect(res.status).toBe(204);
		expect(await db.select().from(t.upload).where(eq(t.upload.id, stored.id))).toEqual([]);
		await expect(readFile(path.join(UPLOAD_DIR, row!.storageKey))).rejects.toThrow(/ENOENT/);
		await expectRefused(await engineer.fetch(stored.downloadUrl), 404, { secrets: [stored.sha256] });
		const disk = await onDisk(booking.id);
		expect(disk.files).toEqual(disk.keys);
	});

	it('holds a booking to ten files (413 for the eleventh), and takes none once it is cancelled', async () => {
		const booking = await book(artist);
		const { keys } = await onDisk(booking.id);
		for (let i = keys.length; i < 10; i++)
			expect((await upload(artist, booking.id, wav(50 + i), `take-${i}.wav`)).status).toBe(201);
		const eleventh = await upload(artist, booking.id, wav(), 'take-11.wav');
		expect(eleventh.status).toBe(413);
		expect(await eleventh.json()).toMatchObject({ error: 'booking_full' });
		expect((await onDisk(booking.id)).files).toHaveLength(10);

		await db.update(t.booking).set({ status: 'cancelled' }).where(eq(t.booking.id, booking.id));
		const first = (await onDisk(booking.id)).keys[0]!;
		const [row] = await db.select({ id: t.upload.id }).from(t.upload).where(eq(t.upload.storageKey, first));
		expect((await artist.fetch(`/api/bookings/${booking.id}/uploads/${row!.id}`, { method: 'DELETE' })).status).toBe(204);
		const closed = await upload(artist, booking.id, wav(), 'late.wav');
		expect(closed.status).toBe(409);
		expect(await closed.json()).toMatchObject({ error: 'booking_closed' });
		const disk = await onDisk(booking.id);
		expect(disk.files).toEqual(disk.keys);
		expect(disk.keys).toHaveLength(9);
	});
});
