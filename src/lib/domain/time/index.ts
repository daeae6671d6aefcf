/**
 * Slateroom's time engine: wall clock ↔ instant in the studio's IANA zone (zoned.ts), calendar
 * dates 'YYYY-MM-DD' (dates.ts), the booking grid (grid.ts), the one booking-time reader
 * (parse.ts) and formatting at the edges (format.ts). Pure TypeScript over date-fns' @date-fns/tz.
 */
export {
	addDays,
	addMonths,
	addWallMinutes,
	clockLabel,
	clockMinutes,
	daysFrom,
	daysInMonth,
	eachDay,
	formatYmd,
	isoWeekday,
	isYmd,
	maxYmd,
	minYmd,
	mondayOf,
	parseClock,
	parseYmd,
	type CalendarDate
} from './dates';
export {
	addLocalDays,
	assertTimeZone,
	localDateOf,
	localDayBounds,
	localParts,
	localSegments,
	localToInstant,
	offsetMsAt,
	resolveWallTime,
	zonedWallTime,
	type LocalParts,
	type LocalSegment,
	type ResolvedLocalTime,
	type WallTimeResolution
} from './zoned';
export { ceilToLocalGrid, floorToLocalGrid, isOnLocalGrid } from './grid';
export { parseBookingInstant } from './parse';
export {
	formatCalendarDate,
	formatDate,
	formatDateTime,
	formatDuration,
	formatEndTime,
	formatRange,
	formatTime,
	formatTimes,
	isoInZone,
	wallClock,
	wallDateTime
} from './format';
export { NonexistentLocalTimeError, TimeInputError, type TimeInputErrorCode } from './errors';
