// Bookings: requests, the calendar they meet, holds, and reading bookings as each role may.
// Routes import this module as a namespace (`import * as bookings from '$lib/server/bookings'`).
export {
	parseBookingRequest,
	requestFromChoices,
	zodFieldErrors,
	type BookingRequest,
	type FieldErrors,
	type InvalidRequest
} from './request';
export { pricingContext, type PricingContext } from './context';
export { expireLapsedHolds, holdLapsedSql } from './occupancy';
export { availability, rebookable, type AvailabilityResult } from './availability';
export { priceRequest, publicQuote, quoteFor, type Priced } from './quote';
export { createHold, holdAndCheckout, type HoldOutcome, type HoldRefusal, type HeldWithCheckout } from './hold';
export {
	billedTo,
	bookingJson,
	canSeeAll,
	getForViewer,
	getRow,
	actorAt,
	listInStudio,
	listOwn,
	roleAt,
	ownerDesk,
	type BookingDetail,
	type BookingRow
} from './read';
