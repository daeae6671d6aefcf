import { getPolicy, listRooms, publicRoom } from '$lib/server/studio';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ parent }) => {
	const { storefront } = await parent();
	const { studio, policy } = await getPolicy(storefront.id);
	const rooms = await listRooms(studio.id);
	return {
		about: {
			pricesIncludeVat: studio.pricesIncludeVat,
			vatRatePercent: studio.vatRateBp / 100,
			halfDayHours: studio.halfDayMinutes / 60,
			fullDayHours: studio.fullDayMinutes / 60,
			engineer: { hourly: studio.engineerHourly, halfDay: studio.engineerHalfDay, fullDay: studio.engineerFullDay }
		},
		policy: {
			surcharges: policy.surcharges.map((s) => ({
				label: s.label,
				kind: s.kind,
				percent: s.percentBp / 100,
				weekdays: s.weekdays,
				fromMinute: s.fromMinute,
				toMinute: s.toMinute
			})),
			openingHours: policy.openingHours,
			minBookingMinutes: policy.minBookingMinutes,
			incrementMinutes: policy.incrementMinutes,
			turnaroundMinutes: policy.turnaroundMinutes,
			minNoticeHours: policy.minNoticeMinutes / 60,
			horizonDays: policy.horizonDays,
			holdMinutes: policy.holdMinutes,
			depositPercent: policy.depositBp / 100,
			depositMinimum: policy.depositMinimum,
			cancellation: policy.cancellation.map((c) => ({ minNoticeHours: c.minNoticeHours, refundPercent: c.refundBp / 100 })),
			overtimeIncrementMinutes: policy.overtimeIncrementMinutes
		},
		rooms: rooms.map((r) => publicRoom(r, studio.currency))
	};
};
