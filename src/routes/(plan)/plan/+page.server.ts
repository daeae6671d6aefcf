import { error, fail } from '@sveltejs/kit';
import { z } from 'zod';
import { requireRole } from '$lib/server/guard';
import { dayPlan, isPlanDate, saveRecall, todayInStudio } from '$lib/server/plan';
import { audit } from '$lib/server/audit';
import { staffActor } from '$lib/server/actor';
import { feedTokenOf, replaceFeedToken } from '$lib/server/feed';
import type { RecallChannel } from '$lib/server/db/schema';
import { CONTROL_CHARS_MESSAGE, DATE_MESSAGE, dateProblem, hasControlChars, lineText, multilineText } from '$lib/schemas/input';
import { formText, readFormData } from '$lib/server/api';
import { addDays } from '$lib/domain/time';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	const me = requireRole(locals, 'owner', 'engineer');
	const { studioId } = staffActor(locals, null);
	const date = url.searchParams.get('date') ?? (await todayInStudio(studioId));
	if (!isPlanDate(date)) error(400, { message: dateProblem(date) ?? DATE_MESSAGE });
	const [plan, feedToken] = await Promise.all([dayPlan(studioId, date), feedTokenOf(me.id)]);
	return {
		plan,
		feedUrl: feedToken ? `${url.origin}/feed/${feedToken}/sessions.ics` : null,
		prev: addDays(date, -1),
		next: addDays(date, 1)
	};
};

const optionalNumber = (min: number, max: number, what: string) =>
	z
		.string()
		.trim()
		.transform((v) => (v === '' ? null : Number(v)))
		.refine((v) => v === null || (Number.isFinite(v) && v >= min && v <= max), {
			error: `${what} must be between ${min} and ${max}.`
		});

const channelSchema = z.object({
	source: lineText().trim().max(120),
	microphone: lineText().trim().max(160),
	placement: lineText().trim().max(200),
	preampGainDb: optionalNumber(0, 80, 'Preamp gain'),
	highPassHz: optionalNumber(20, 500, 'High-pass'),
	compressor: lineText().trim().max(200),
	notes: multilineText().trim().max(500)
});

export const actions: Actions = {
	feed: async ({ locals, getClientAddress }) => {
		const me = requireRole(locals, 'owner', 'engineer');
		await replaceFeedToken(me.id);
		await audit({ actorId: me.id, action: 'feed.replaced', entity: 'user', entityId: me.id, ip: getClientAddress() });
		return { feedReplaced: true };
	},
	recall: async ({ request, locals, getClientAddress }) => {
		const me = requireRole(locals, 'owner', 'engineer');
		const form = await readFormData(request);
		if (!form) return fail(400, { bookingId: '', error: 'The form could not be read.' });
		const bookingId = formText(form.get('bookingId'));
		if (!z.uuid().safeParse(bookingId).success) return fail(422, { bookingId, error: 'Unknown session.' });
		const count = Math.min(Number(form.get('rows') ?? 0) || 0, 40);
		const channels: RecallChannel[] = [];
		for (let i = 0; i < count; i++) {
			const get = (k: string) => formText(form.get(`${k}-${i}`));
			const parsed = channelSchema.safeParse({
				source: get('source'),
				microphone: get('microphone'),
				placement: get('placement'),
				preampGainDb: get('preampGainDb'),
				highPassHz: get('highPassHz'),
				compressor: get('compressor'),
				notes: get('notes')
			});
			if (!parsed.success) return fail(422, { bookingId, error: `Row ${i + 1}: ${parsed.error.issues[0]?.message}` });
			if (!parsed.data.source && !parsed.data.microphone) continue;
			channels.push({ ...parsed.data, phantom: form.get(`phantom-${i}`) === 'on' });
		}
		const notes = formText(form.get('notes')).slice(0, 4000);
		if (hasControlChars(notes, true)) return fail(422, { bookingId, error: `Notes: ${CONTROL_CHARS_MESSAGE}` });
		if (!(await saveRecall(staffActor(locals, getClientAddress()), bookingId, channels, notes)))
			return fail(404, { bookingId, error: 'Unknown session.' });
		await audit({ actorId: me.id, action: 'recall.saved', entity: 'booking', entityId: bookingId, ip: getClientAddress() });
		return { bookingId, saved: true };
	}
};
