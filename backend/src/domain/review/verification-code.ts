// Verification codes printed on cage records and check-run reports: long enough that nobody guesses one (135 random bits),
// written in Crockford's base32 so they survive being read aloud or typed from paper, grouped in
// fours, with a check character that catches a mistyped or swapped character before a look-up.
// The randomness comes in as bytes: the caller draws them (node:crypto or crypto.getRandomValues).

export const CROCKFORD_ALPHABET = '0123456789ABCDEFGHJKMNPQRSTVWXYZ';
/** Random characters (5 bits each) and the check character. */
export const CODE_DATA_CHARS = 27;
export const CODE_LENGTH = CODE_DATA_CHARS + 1;
export const CODE_RANDOM_BITS = CODE_DATA_CHARS * 5;
/** Bytes newVerificationCode needs: 135 bits fit in 17 bytes. */
export const CODE_RANDOM_BYTES = Math.ceil(CODE_RANDOM_BITS / 8);
const GROUP = 4;

/** Luhn mod 32 over the alphabet: the character that makes the weighted sum divisible by 32. */
function checkCharacter(data: string): string {
  const n = CROCKFORD_ALPHABET.length;
  let factor = 2;
  let sum = 0;
  for (let i = data.length - 1; i >= 0; i--) {
    let addend = factor * CROCKFORD_ALPHABET.indexOf(data[i]);
    factor = factor === 2 ? 1 : 2;
    addend = Math.floor(addend / n) + (addend % n);
    sum += addend;
  }
  return CROCKFORD_ALPHABET[(n - (sum % n)) % n];
}

function group(code: string): string {
  return code.match(new RegExp(`.{1,${GROUP}}`, 'g'))?.join('-') ?? code;
}

/** A new code from at least CODE_RANDOM_BYTES random bytes, e.g. "7K2Q-MX9D-…" (7 groups of 4). */
export function newVerificationCode(randomBytes: Uint8Array): string {
  if (randomBytes.length < CODE_RANDOM_BYTES)
    throw new RangeError(
      `A verification code needs ${CODE_RANDOM_BYTES} random bytes; got ${randomBytes.length}.`,
    );
  let bits = 0;
  let buffer = 0;
  let data = '';
  for (const byte of randomBytes.subarray(0, CODE_RANDOM_BYTES)) {
    buffer = (buffer << 8) | byte;
    bits += 8;
    while (bits >= 5 && data.length < CODE_DATA_CHARS) {
      data += CROCKFORD_ALPHABET[(buffer >> (bits - 5)) & 31];
      bits -= 5;
    }
    buffer &= (1 << bits) - 1;
  }
  return group(data + checkCharacter(data));
}

/**
 * What a person typed, as the stored form: upper case, separators dropped, the letters people
 * confuse with digits read as those digits (O → 0, I and L → 1). A complete code comes back
 * grouped; anything else comes back cleaned so the caller can still show it.
 */
export function normaliseVerificationCode(input: string): string {
  const cleaned = input
    .slice(0, 200)
    .toUpperCase()
    .replace(/[\s\-_.–—]/g, '')
    .replace(/O/g, '0')
    .replace(/[IL]/g, '1');
  const complete =
    cleaned.length === CODE_LENGTH && [...cleaned].every((c) => CROCKFORD_ALPHABET.includes(c));
  return complete ? group(cleaned) : cleaned;
}

/** True for a code of the right length and alphabet whose check character matches. */
export function isWellFormedVerificationCode(input: string): boolean {
  const code = normaliseVerificationCode(input).replace(/-/g, '');
  if (code.length !== CODE_LENGTH || ![...code].every((c) => CROCKFORD_ALPHABET.includes(c))) return false;
  return checkCharacter(code.slice(0, CODE_DATA_CHARS)) === code[CODE_DATA_CHARS];
}

/**
 * Check runs made before one generator served both kinds of code carry 24 characters of the same
 * alphabet, ungrouped and without a check character (120 random bits). They are printed on PDFs
 * already kept by builders, so they keep verifying; no new code is made in this form.
 */
export const LEGACY_CHECK_RUN_CODE_LENGTH = 24;

export type CodeForLookup =
  /** A current code (cage record or check run), grouped as stored. */
  | { form: 'current'; code: string }
  /** A 24-character check-run code of the older form, as stored (ungrouped). */
  | { form: 'legacy_check_run'; code: string }
  | { form: 'malformed'; code: string };

/** What a typed code should be looked up as: the stored spelling of a current or an older code. */
export function codeForLookup(input: string): CodeForLookup {
  const code = normaliseVerificationCode(input);
  if (isWellFormedVerificationCode(code)) return { form: 'current', code };
  const plain = code.replace(/-/g, '');
  if (plain.length === LEGACY_CHECK_RUN_CODE_LENGTH && [...plain].every((c) => CROCKFORD_ALPHABET.includes(c))) return { form: 'legacy_check_run', code: plain };
  return { form: 'malformed', code };
}
