// Sign-in and sign-up through better-auth's server API, with our own limits, messages and audit.
import { currentMembership, membershipsOf } from './team';
import { APIError } from 'better-auth/api';
import { auth } from './auth';
import { audit } from './audit';
import { checkAndCountSignUp, checkSignInLimit, recordSignInFailure, recordSignInSuccess } from './rate-limit';
import { waitWords } from '$lib/domain/sign-in-limits';

export type AuthOutcome =
	| { ok: true; userId: string; role: string }
	| { ok: false; status: 400 | 422 | 429; message: string; field?: 'email' | 'password' };

/** One message for a wrong password and an unknown e-mail: it must not tell which accounts exist. */
export const BAD_CREDENTIALS = 'That e-mail and password do not match. Check both and try again.';

export async function signIn(input: { email: string; password: string }, headers: Headers, ip: string): Promise<AuthOutcome> {
	// Counted per account and address together, so a stranger's guesses never lock the owner out
	// (src/lib/domain/sign-in-limits.ts).
	const limit = await checkSignInLimit(ip, input.email);
	if (!limit.allowed) {
		await audit({ action: 'auth.sign_in.limited', data: { email: input.email, reason: limit.reason }, ip });
		return {
			ok: false,
			status: 429,
			message:
				limit.reason === 'account'
					? `Too many wrong passwords for this account from here. Wait ${waitWords(limit.retryAfterSeconds)} before trying again.`
					: `Too many failed sign-ins from your network. Wait ${waitWords(limit.retryAfterSeconds)} before trying again.`
		};
	}
	try {
		const result = await auth.api.signInEmail({ body: { email: input.email, password: input.password }, headers });
		await recordSignInSuccess(ip, input.email);
		// Where to land: the role in the studio they work at first, or an artist's home.
		const role = currentMembership(await membershipsOf(result.user.id), null)?.role ?? 'artist';
		await audit({ actorId: result.user.id, action: 'auth.sign_in', entity: 'user', entityId: result.user.id, ip });
		return { ok: true, userId: result.user.id, role };
	} catch (e) {
		if (e instanceof APIError) {
			await recordSignInFailure(ip, input.email);
			await audit({ action: 'auth.sign_in.failed', data: { email: input.email }, ip });
			return { ok: false, status: 400, message: BAD_CREDENTIALS };
		}
		throw e;
	}
}

export async function signUp(
	input: { name: string; email: string; password: string },
	headers: Headers,
	ip: string
): Promise<AuthOutcome> {
	const limit = await checkAndCountSignUp(ip);
	if (!limit.allowed) {
		return {
			ok: false,
			status: 429,
			message: `Too many sign-ups from this address. Wait ${waitWords(limit.retryAfterSeconds)} before trying again.`
		};
	}
	try {
		// Only these three fields reach better-auth: a role or anything else in the form is ignored.
		const result = await auth.api.signUpEmail({
			body: { name: input.name, email: input.email, password: input.password },
			headers
		});
		await audit({ actorId: result.user.id, action: 'auth.sign_up', entity: 'user', entityId: result.user.id, ip });
		return { ok: true, userId: result.user.id, role: 'artist' };
	} catch (e) {
		if (e instanceof APIError) {
			const code = (e.body as { code?: string } | undefined)?.code ?? '';
			await audit({ action: 'auth.sign_up.failed', data: { email: input.email, code }, ip });
			if (code.includes('PASSWORD')) {
				return { ok: false, status: 422, field: 'password', message: 'Choose a password of 10 to 128 characters.' };
			}
			// Same words whether or not the address is taken, so the form does not reveal accounts.
			return {
				ok: false,
				status: 400,
				field: 'email',
				message: 'We could not create an account with these details. If you already have one, sign in instead.'
			};
		}
		throw e;
	}
}
