import { json } from '@sveltejs/kit';
import * as bookings from '$lib/server/bookings';
import { apiError } from '$lib/server/api';
import { getStudio } from '$lib/server/studio';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ locals }) => {
	if (!locals.user) return apiError(401, 'unauthenticated', 'Please sign in first.');
	// The accountant reads bookings only through the accounts, one at a time.
	if (locals.user.role === 'accountant') return apiError(403, 'forbidden', 'Your role reads the accounts, not the booking list.');
	const [studio, rows] = await Promise.all([getStudio(), bookings.listForViewer(locals.user)]);
	return json({ bookings: rows.map((b) => bookings.bookingJson(b, studio.timeZone)) });
};
