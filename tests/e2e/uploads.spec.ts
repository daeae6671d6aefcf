import { holdFirstFree, signIn, expect, test } from './support';
import { workdaysAhead } from '../support/dates';
import { wav } from '../support/audio';

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
	const { id: bookingId } = await holdFirstFree(page.request, 'vocal-booth', DAYS, SLOTS);
	expect(bookingId).not.toBe('');

	await page.goto(`/bookings/${bookingId}`);
	const files = page.getByTestId('session-files');
	await expect(files.getByRole('heading', { name: 'Files for the session' })).toBeVisible();
	await expect(files.getByTestId('files-empty')).toBeVisible();
	await expect(files).toContainText('up to 4 MB a file');

	await files
		.getByLabel('Add a file')
		.setInputFiles({ name: 'Reference mix, Kesäyö.wav', mimeType: 'audio/wav', buffer: Buffer.from(wav(800)) });
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
