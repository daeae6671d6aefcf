// The artist's uploads to a booking (reference tracks, lyric sheets), scoped by the acting user
// (OWASP ASVS 8.2.2), by the person's role at the booking's own studio: the booking's artist and
// the studio's owner add and remove files; they and its engineers list and download them; another
// artist, or staff of another studio, gets a 404, as for a booking that does not exist; the
// studio's accountant gets nothing.
//
// Files live under UPLOAD_DIR/<booking id>/<random uuid>: the path is the server's own (ASVS
// 5.3.2), the type comes from the content (5.2.2), and the size is counted as the bytes arrive
// (5.2.1). A file is written as <uuid>.part and renamed only once whole and accepted; its row is
// written last, so a failure at any step leaves neither a row nor a stray file behind.
import { createHash, randomUUID } from 'node:crypto';
import { mkdir, open, readdir, rename, rm, stat } from 'node:fs/promises';
import path from 'node:path';
import { and, asc, count, eq, inArray, sum } from 'drizzle-orm';
import { fileTypeFromBuffer } from 'file-type';
import { env } from '$env/dynamic/private';
import {
	displayName,
	judgeContent,
	labelFor,
	quotaProblem,
	roomForOneFile,
	SNIFF_BYTES,
	uploadLimits,
	TextCheck,
	audioStart,
	PROBE_BYTES,
	formatBytes,
	type BookingUsage,
	type UploadLimits
} from '$lib/domain/uploads';
import { db } from './db';
import { audit } from './audit';
import { booking, upload } from './db/schema';
import { holdLapsed, isCancellable, type BookingStatus } from '$lib/domain/lifecycle';
import { isBodyTooLarge, type IncomingFile } from './multipart';
import type { SessionUser } from './auth';
import { actorAt } from './bookings/read';
import { isUuid } from '$lib/uuid';

export type UploadRow = typeof upload.$inferSelect;

export interface Failure {
	ok: false;
	status: 403 | 404 | 409 | 413 | 415 | 422;
	error: string;
	message: string;
}

const fail = (status: Failure['status'], error: string, message: string): Failure => ({ ok: false, status, error, message });
const NOT_FOUND = fail(404, 'not_found', 'No such booking.');
const FORBIDDEN = fail(403, 'forbidden', 'Your role does not give access to the files of a booking.');

export function limits(): UploadLimits {
	return uploadLimits(env.UPLOAD_MAX_BYTES);
}

export function uploadRoot(): string {
	return path.resolve(env.UPLOAD_DIR || '.data/uploads');
}

/** The absolute path of a stored file; a key that would lead outside UPLOAD_DIR is refused. */
function storedPath(storageKey: string): string {
	const root = uploadRoot();
	const full = path.resolve(root, storageKey);
	if (!full.startsWith(root + path.sep)) throw new Error(`storage key outside the upload folder: ${storageKey}`);
	return full;
}

/** A booking takes new files while it is still ahead and wanted, a held one only while its hold lasts. */
export function uploadsOpen(b: { status: BookingStatus; holdExpiresAt: Date | null }, now = new Date()): boolean {
	return isCancellable(b.status) && !holdLapsed(b, now);
}

type Access = 'read' | 'write';

function roleMay(actor: SessionUser, access: Access): boolean {
	if (actor.role === 'owner' || actor.role === 'artist') return true;
	return actor.role === 'engineer' && access === 'read';
}

/**
 * The booking with the person as they stand at its studio, when they may know it exists: its
 * artist, or anyone in its studio's team. Undefined otherwise (a 404).
 */
async function visibleBooking(person: SessionUser, bookingId: string) {
	const [b] = await db
		.select({
			id: booking.id,
			studioId: booking.studioId,
			artistId: booking.artistId,
			status: booking.status,
			holdExpiresAt: booking.holdExpiresAt
		})
		.from(booking)
		.where(eq(booking.id, bookingId));
	if (!b) return undefined;
	const actor = await actorAt(person, b.studioId);
	if (actor.role === 'artist' && b.artistId !== person.id) return undefined;
	return { booking: b, actor };
}

async function gate(person: SessionUser, bookingId: string, access: Access) {
	const seen = await visibleBooking(person, bookingId);
	if (!seen) return NOT_FOUND;
	const { actor } = seen;
	if (!roleMay(actor, access)) {
		// An engineer may read a booking's files but not change them.
		return actor.role === 'engineer' ? fail(403, 'forbidden', 'Only the artist and the owner add or remove files.') : FORBIDDEN;
	}
	return { ok: true, booking: seen.booking, actor } as const;
}

export async function usage(bookingId: string, tx: Pick<typeof db, 'select'> = db): Promise<BookingUsage> {
	const [row] = await tx
		.select({ files: count(), bytes: sum(upload.sizeBytes) })
		.from(upload)
		.where(eq(upload.bookingId, bookingId));
	return { files: row?.files ?? 0, bytes: Number(row?.bytes ?? 0) };
}

const listColumns = {
	id: upload.id,
	bookingId: upload.bookingId,
	originalName: upload.originalName,
	contentType: upload.contentType,
	sizeBytes: upload.sizeBytes,
	sha256: upload.sha256,
	createdAt: upload.createdAt
};
export type UploadSummary = Awaited<ReturnType<typeof summariesFor>>[number];

/** The files of a booking, for someone who may see them. */
export async function listForViewer(actor: SessionUser, bookingId: string) {
	const g = await gate(actor, bookingId, 'read');
	if (!g.ok) return g;
	const rows = await summariesFor([bookingId]);
	return {
		ok: true as const,
		uploads: rows,
		// The rows are the booking's files already: what they use needs no second query.
		usage: { files: rows.length, bytes: rows.reduce((sum, r) => sum + r.sizeBytes, 0) } satisfies BookingUsage,
		limits: limits(),
		open: uploadsOpen(g.booking),
		mayChange: roleMay(g.actor, 'write'),
		studioId: g.booking.studioId
	};
}

/** The files of several bookings, oldest first (for the day plan, whose page checks the role). */
export async function summariesFor(bookingIds: string[]) {
	if (!bookingIds.length) return [];
	const rows = await db
		.select(listColumns)
		.from(upload)
		.where(inArray(upload.bookingId, bookingIds))
		.orderBy(asc(upload.createdAt));
	return rows.map((r) => ({ ...r, name: r.originalName, typeLabel: labelFor(r.contentType), href: `/uploads/${r.id}` }));
}

/** The upload as the JSON API shows it. */
export function uploadJson(
	u: Pick<UploadRow, 'id' | 'bookingId' | 'originalName' | 'contentType' | 'sizeBytes' | 'sha256' | 'createdAt'>,
	isoInZone: (d: Date) => string
) {
	return {
		id: u.id,
		bookingId: u.bookingId,
		name: u.originalName,
		contentType: u.contentType,
		type: labelFor(u.contentType),
		sizeBytes: u.sizeBytes,
		sha256: u.sha256,
		createdAt: isoInZone(u.createdAt),
		downloadUrl: `/uploads/${u.id}`
	};
}

const tooLarge = (message: string, error = 'too_large') => fail(413, error, message);

/**
 * Stores one file for a booking. Reads the stream once: counting, hashing, checking the text and
 * writing as it goes, and giving up as soon as the file passes what the booking can still take.
 */
export async function save(
	actor: SessionUser,
	bookingId: string,
	file: IncomingFile
): Promise<{ ok: true; upload: UploadRow } | Failure> {
	const g = await gate(actor, bookingId, 'write');
	if (!g.ok) return g;
	if (!uploadsOpen(g.booking))
		return fail(409, 'booking_closed', 'Files can be added while the booking is held, pending or confirmed.');
	const lim = limits();
	const used = await usage(bookingId);
	const full = quotaProblem(used, lim);
	if (full) return tooLarge(full, 'booking_full');
	const room = roomForOneFile(used, lim);
	const name = displayName(file.name);

	const id = randomUUID();
	const storageKey = `${bookingId}/${id}`;
	const finalPath = storedPath(storageKey);
	const partPath = `${finalPath}.part`;
	await mkdir(path.dirname(finalPath), { recursive: true, mode: 0o700 });
	let leftover: string | null = partPath;
	const source = file.stream[Symbol.asyncIterator]();
	try {
		let size = 0;
		const hash = createHash('sha256');
		const text = new TextCheck();
		const head: Uint8Array[] = [];
		let headBytes = 0;
		const out = await open(partPath, 'wx', 0o600);
		try {
			for (;;) {
				let next: IteratorResult<Uint8Array>;
				try {
					next = await source.next();
				} catch (e) {
					// The body broke off or passed BODY_SIZE_LIMIT while this file was arriving.
					if (isBodyTooLarge(e)) return tooLarge(`A file can be at most ${formatBytes(lim.maxFileBytes)}.`);
					return fail(422, 'incomplete', 'The upload did not arrive whole. Please try again.');
				}
				if (next.done) break;
				const chunk = next.value;
				size += chunk.length;
				if (size > room) {
					void source.return?.();
					return tooLarge(
						size > lim.maxFileBytes
							? `A file can be at most ${formatBytes(lim.maxFileBytes)}.`
							: (quotaProblem(used, lim, size) ?? 'The booking has no room left for this file.')
					);
				}
				hash.update(chunk);
				text.push(chunk);
				if (headBytes < SNIFF_BYTES) {
					const part = chunk.subarray(0, SNIFF_BYTES - headBytes);
					head.push(part);
					headBytes += part.length;
				}
				await out.write(chunk);
			}
			await out.sync();
		} finally {
			await out.close();
		}
		if (size === 0) return fail(422, 'empty', `“${name}” is empty.`);

		// ASVS 5.2.2: the type from the first bytes (file-type's signatures), never the name or the browser's claim.
		const first = Buffer.concat(head);
		const detected = await fileTypeFromBuffer(first);
		// MP3 and AAC frames are checked where the audio starts, which a large ID3 tag (cover art)
		// can put past the first bytes: read them back from the file.
		const probe =
			detected?.mime === 'audio/mpeg' || detected?.mime === 'audio/aac' ? await readAt(partPath, audioStart(first)) : undefined;
		const verdict = judgeContent({ detected, text: text.finish(), head: first, probe, name });
		if (!verdict.ok) return fail(415, 'unsupported_type', verdict.message);

		await rename(partPath, finalPath);
		leftover = finalPath;
		const sha256 = hash.digest('hex');
		const outcome = await db.transaction(async (tx) => {
			// One upload at a time per booking, so two at once cannot both squeeze under the limits.
			const [b] = await tx
				.select({ studioId: booking.studioId, status: booking.status, holdExpiresAt: booking.holdExpiresAt })
				.from(booking)
				.where(eq(booking.id, bookingId))
				.for('update');
			if (!b || !uploadsOpen(b))
				return fail(409, 'booking_closed', 'Files can be added while the booking is held, pending or confirmed.');
			const problem = quotaProblem(await usage(bookingId, tx), lim, size);
			if (problem) return tooLarge(problem, 'booking_full');
			const [row] = await tx
				.insert(upload)
				.values({
					studioId: b.studioId,
					bookingId,
					uploaderId: actor.id,
					originalName: name,
					storageKey,
					contentType: verdict.type.contentType,
					sizeBytes: size,
					sha256
				})
				.returning();
			return { ok: true as const, upload: row! };
		});
		if (outcome.ok) leftover = null;
		return outcome;
	} finally {
		if (leftover) await rm(leftover, { force: true });
	}
}

/** Up to PROBE_BYTES of a file from `offset` on. */
async function readAt(file: string, offset: number): Promise<Uint8Array> {
	const handle = await open(file, 'r');
	try {
		const buffer = Buffer.alloc(PROBE_BYTES);
		const { bytesRead } = await handle.read(buffer, 0, PROBE_BYTES, offset);
		return buffer.subarray(0, bytesRead);
	} finally {
		await handle.close();
	}
}

/** A file to download, for someone who may see its booking, by their role at the booking's studio. */
export async function getForDownload(person: SessionUser, uploadId: string) {
	const [row] = await db
		.select({ upload, artistId: booking.artistId })
		.from(upload)
		.innerJoin(booking, eq(booking.id, upload.bookingId))
		.where(eq(upload.id, uploadId));
	if (!row) return fail(404, 'not_found', 'No such file.');
	const actor = await actorAt(person, row.upload.studioId);
	if (actor.role === 'artist' && row.artistId !== person.id) return fail(404, 'not_found', 'No such file.');
	if (!roleMay(actor, 'read')) return FORBIDDEN;
	return { ok: true as const, upload: row.upload, path: storedPath(row.upload.storageKey) };
}

/** Removes a file: its row first, then the bytes (a file without a row is swept later). */
export async function remove(
	actor: SessionUser,
	bookingId: string,
	uploadId: string
): Promise<{ ok: true; upload: UploadRow } | Failure> {
	const g = await gate(actor, bookingId, 'write');
	if (!g.ok) return g;
	// The booking page sends the file's id in a form field, past no route matcher.
	if (!isUuid(uploadId)) return fail(404, 'not_found', 'No such file.');
	const [row] = await db
		.delete(upload)
		.where(and(eq(upload.id, uploadId), eq(upload.bookingId, bookingId)))
		.returning();
	if (!row) return fail(404, 'not_found', 'No such file.');
	await rm(storedPath(row.storageKey), { force: true }).catch((e: unknown) =>
		console.warn('[uploads] could not delete', row.storageKey, (e as Error).message)
	);
	return { ok: true, upload: row };
}

/** The audit line of a file added to a session, the same from the booking page and the API. */
export async function auditAdded(actor: SessionUser, bookingId: string, u: UploadRow, ip: string): Promise<void> {
	await audit({
		actorId: actor.id,
		action: 'upload.added',
		entity: 'booking',
		entityId: bookingId,
		data: { upload: u.id, sizeBytes: u.sizeBytes, sha256: u.sha256 },
		ip
	});
}

/** The audit line of a file removed from a session. */
export async function auditRemoved(actor: SessionUser, bookingId: string, uploadId: string, ip: string): Promise<void> {
	await audit({
		actorId: actor.id,
		action: 'upload.removed',
		entity: 'booking',
		entityId: bookingId,
		data: { upload: uploadId },
		ip
	});
}

const SWEEP_EVERY_MS = 60 * 60_000;
const STALE_AFTER_MS = 60 * 60_000;
let lastSweep = 0;

/**
 * Removes what a crash or a lost connection could leave: `.part` files, and stored files with no
 * row, once they are an hour old (a younger one may belong to an upload still under way).
 */
export async function sweepStrays(now = Date.now()): Promise<number> {
	const root = uploadRoot();
	const folders = await readdir(root, { withFileTypes: true }).catch(() => []);
	let removed = 0;
	for (const folder of folders) {
		if (!folder.isDirectory() || !isUuid(folder.name)) continue;
		const names = await readdir(path.join(root, folder.name)).catch(() => [] as string[]);
		if (!names.length) continue;
		const known = new Set(
			(await db.select({ key: upload.storageKey }).from(upload).where(eq(upload.bookingId, folder.name))).map((r) => r.key)
		);
		for (const name of names) {
			const key = `${folder.name}/${name}`;
			if (known.has(key)) continue;
			const full = path.join(root, folder.name, name);
			const info = await stat(full).catch(() => null);
			if (!info || now - info.mtimeMs < STALE_AFTER_MS) continue;
			await rm(full, { force: true });
			removed++;
		}
	}
	return removed;
}

/** The periodic job's turn: sweeps at most every SWEEP_EVERY_MS, whatever the jobs' interval. */
export async function sweepStraysNow(): Promise<void> {
	if (Date.now() - lastSweep < SWEEP_EVERY_MS) return;
	lastSweep = Date.now();
	const removed = await sweepStrays();
	if (removed) console.info(`[uploads] removed ${removed} stray file(s)`);
}
