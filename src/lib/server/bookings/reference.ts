// Booking references people read out on the phone and type from an e-mail: the studio's prefix
// (two to four capitals, HP for Hollow Pine, so a reference says whose it is among the studios
// that share the app) and eight symbols drawn at random from Crockford's Base32 alphabet
// (crockford.com/base32.html: the digits and the capitals without I, L, O and U, so nothing reads
// as another letter or as a word), in two groups of four: HP-7K3Q-XM2P. 32 symbols divide 256, so
// each random byte gives one symbol with no bias; 40 bits make a repeat rare, and the unique
// index on (studio, reference) refuses one (the hold then draws again).
import { REFERENCE_PREFIX_PATTERN } from '$lib/domain/setup';

const ALPHABET = '0123456789ABCDEFGHJKMNPQRSTVWXYZ';

export function newReference(prefix: string): string {
	if (!REFERENCE_PREFIX_PATTERN.test(prefix)) throw new RangeError(`a reference prefix is 2 to 4 capitals, not "${prefix}"`);
	const symbols = [...crypto.getRandomValues(new Uint8Array(8))].map((b) => ALPHABET[b % ALPHABET.length]).join('');
	return `${prefix}-${symbols.slice(0, 4)}-${symbols.slice(4)}`;
}
