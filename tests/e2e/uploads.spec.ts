import { signIn, expect, test } from './support';
import { workdaysAhead } from '../support/dates';

/** A mono 16-bit 8 kHz PCM WAV: the 44-byte RIFF/WAVE header and a short 440 Hz tone. */
function wav(samples = 800): Buffer {
	const buf = Buffer.alloc(44 + samples * 2);
	buf.write('RIFF', 0, 'ascii');
	buf.writeUInt32LE(36 + samples * 2, 4);
	buf.write('WAVEfmt ', 8, 'ascii');
	buf.writeUInt32LE(16, 16);
	buf.writeUInt16LE(1, 20);
	buf.writeUInt16LE(1, 22);
	buf.writeUInt32LE(8000, 24);
	buf.writeUInt32LE(16000, 28);
	buf.writeUInt16LE(2, 32);
	buf.writeUInt16LE(16, 34);
	buf.write('data', 36, 'ascii');
	buf.writeUInt32LE(samples * 2, 40);
	for (let i = 0; i < samples; i++) buf.writeInt16LE(Math.round(8000 * Math.sin((2 * Math.PI * 440 * i) / 8000)), 44 + i * 2);
	return buf;
}

/** The uploads specs' days (working weekdays from 150 days ahead) and two-hour slots, tried in order. */
const DAYS = workdaysAhead(150, 15);
const SLOTS = [
	['16:30', '18:30'],
	['09:00', '11:00'],
	['11:30', '13:30'],
	['14:00', '16:00']
] as const;

test('the artist uploads a reference track on the booking page and sees it listed', async ({ page }) => {
	await signIn(page, 'artist@slateroom.test');
	let bookingId = '';
	for (const day of DAYS) {
		for (const [from, to] of SLOTS) {
			const res = await page.request.post('/api/bookings', {
				data: { room: 'vocal-booth', start: `${day}T${from}`, end: `${day}T${to}` }
			});
			if (res.status() === 409) continue;
			expect(res.status()).toBe(201);
			bookingId = ((await res.json()) as { id: string }).id;
			break;
		}
		if (bookingId) break;
	}
	expect(bookingId).not.toBe('');

	await page.goto(`/bookings/${bookingId}`);
	const files = page.getByTestId('session-files');
	await expect(files.getByRole('heading', { name: 'Files for the session' })).toBeVisible();
	await expect(files.getByTestId('files-empty')).toBeVisible();
	await expect(files).toContainText('up to 4 MB a file');

	await files.getByLabel('Add a file').setInputFiles({ name: 'Reference mix, Kesäyö.wav', mimeType: 'audio/wav', buffer: wav() });
	await files.getByRole('button', { name: 'Upload' }).click();

	await expect(files.getByTestId('files-status')).toHaveText('“Reference mix, Kesäyö.wav” is uploaded.');
	const row = files.getByTestId('file-row').filter({ hasText: 'Reference mix, Kesäyö.wav' });
	await expect(row).toBeVisible();
	await expect(row).toContainText('WAV audio');
	await expect(row).toContainText('1.6 KB');
	await expect(row.getByRole('link', { name: 'Download Reference mix, Kesäyö.wav' })).toHaveAttribute(
		'href',
		/^\/uploads\/[0-9a-f-]{36}$/
	);

	// A page pretending to be audio is refused, and the refusal is announced.
	await files
		.getByLabel('Add a file')
		.setInputFiles({ name: 'track.wav', mimeType: 'audio/wav', buffer: Buffer.from('<html><script>alert(1)</script></html>') });
	await files.getByRole('button', { name: 'Upload' }).click();
	await expect(files.getByRole('alert')).toContainText('“track.wav” is a web page or markup');
	await expect(files.getByTestId('file-row')).toHaveCount(1);
});
