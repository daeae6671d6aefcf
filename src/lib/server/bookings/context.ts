// What pricing and checking a booking need from the studio, read once per request and handed
// down to every step that needs it.
import { publicHolidayChecker } from '$lib/domain/holidays';
import type { StudioPolicy } from '$lib/domain/types';
import { getPolicy, type StudioRow } from '../studio';

export interface PricingContext {
	studio: StudioRow;
	policy: StudioPolicy;
	holidays: (ymd: string) => boolean;
}

export async function pricingContext(): Promise<PricingContext> {
	const { studio, policy } = await getPolicy();
	return { studio, policy, holidays: publicHolidayChecker(policy.country) };
}
