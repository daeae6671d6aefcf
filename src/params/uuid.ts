// `[id=uuid]`: a route segment that is a UUID (RFC 9562 text form, any version), so an address
// with anything else in that place is an unknown page (404) before any handler reads it.
import type { ParamMatcher } from '@sveltejs/kit';
import { isUuid } from '$lib/uuid';

export const match: ParamMatcher = (param) => isUuid(param);
