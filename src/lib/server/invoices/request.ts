// What the accounts endpoints share: who may ask (the accountant and the owner of the studio in
// the address) and which month.
import { apiStaffStudio } from '../storefront';
import type { StudioRow } from '../studio';
import { MONTH_PATTERN, currentMonth } from './month';

export type AccountsRequest =
	{ ok: true; studio: StudioRow; month: string; user: NonNullable<App.Locals['user']> } | { ok: false; response: Response };

export async function accountsRequest(slug: string, locals: App.Locals, url: URL): Promise<AccountsRequest> {
	const found = await apiStaffStudio(slug, locals, ['accountant', 'owner'], 'The accounts are for the accountant and the owner.');
	if (!found.ok) return found;
	const { studio } = found.at;
	const month = url.searchParams.get('month') ?? currentMonth(studio.timeZone);
	return { ok: true, studio, month, user: found.user };
}

export const MONTH_MESSAGE = 'Use a month such as 2027-03.';
export const isMonth = (month: string) => MONTH_PATTERN.test(month);
