// `[id=uuid]`: a route segment that is a UUID (RFC 9562 text form, any version), so an address
// with anything else in that place is an unknown page (404) before any handler reads it.
import type { ParamMatcher } from '@sveltejs/kit';

const UUID_RE = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export const match: ParamMatcher = (param) => UUID_RE.test(param);
