// Only until src/lib/server/bookings.ts imports these from the time engine ($lib/domain/time).
export { isoInZone, localDateOf as localYmd } from '$lib/domain/time';
