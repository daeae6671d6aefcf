// A UUID in its RFC 9562 text form (any version): the one test behind the `[id=uuid]` route
// matcher, and for the few ids that arrive elsewhere (a form field, a folder name on disk).
const UUID_RE = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export function isUuid(value: string): boolean {
	return UUID_RE.test(value);
}
