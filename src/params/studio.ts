import type { ParamMatcher } from '@sveltejs/kit';
import { hasSlugShape } from '$lib/domain/studio-slug';

/** A studio's short name in an address: its shape only (whether the studio exists is the load's to say). */
export const match: ParamMatcher = (param) => hasSlugShape(param);
