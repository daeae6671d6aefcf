// Booking references people read out on the phone and type from an e-mail. They name no studio
// (many studios share the app) and are drawn at random from Crockford's Base32 alphabet
// (crockford.com/base32.html: the digits and the capitals without I, L, O and U, so nothing reads
// as another letter or as a word), in two groups of four: 7K3Q-XM2P. 32 symbols divide 256, so
// each random byte gives one symbol with no bias; 40 bits make a repeat rare, and the unique
// index on booking.reference refuses one (the hold then draws again).
const ALPHABET = '0123456789ABCDEFGHJKMNPQRSTVWXYZ';

export function newReference(): string {
	const symbols = [...crypto.getRandomValues(new Uint8Array(8))].map((b) => ALPHABET[b % ALPHABET.length]).join('');
	return `${symbols.slice(0, 4)}-${symbols.slice(4)}`;
}
