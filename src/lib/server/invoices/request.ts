// What the accounts endpoints share: who may ask (the accountant and the owner) and which month.
import { apiError } from '../api';
import { getStudio, type StudioRow } from '../studio';
import { MONTH_PATTERN, currentMonth } from './month';

export type AccountsRequest =
	{ ok: true; studio: StudioRow; month: string; user: NonNullable<App.Locals['user']> } | { ok: false; response: Response };

export async function accountsRequest(locals: App.Locals, url: URL): Promise<AccountsRequest> {
	if (!locals.user) return { ok: false, response: apiError(401, 'unauthenticated', 'Please sign in first.') };
	if (locals.user.role !== 'accountant' && locals.user.role !== 'owner') {
		return { ok: false, response: apiError(403, 'forbidden', 'The accounts are for the accountant and the owner.') };
	}
	// The accounts of the studio they keep them for (a role of accountant or owner is a membership).
	if (!locals.studio)
		return { ok: false, response: apiError(403, 'forbidden', 'The accounts are for the accountant and the owner.') };
	const studio = await getStudio(locals.studio.studioId);
	const month = url.searchParams.get('month') ?? currentMonth(studio.timeZone);
	return { ok: true, studio, month, user: locals.user };
}

export const MONTH_MESSAGE = 'Use a month such as 2027-03.';
export const isMonth = (month: string) => MONTH_PATTERN.test(month);
