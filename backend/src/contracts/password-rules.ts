// The password rules, in one place: the API's schemas (contracts/auth.ts) and every password form of
// the front end (sign-up by invitation, change, reset) read these. No zod here, so a small public page
// can import it without the schema library.
export const passwordMinLength = 10;
export const passwordMaxLength = 200;

/** The words about the rules, the same from the API's 400 and from a form before sending. */
export const passwordWords = {
  /** The standing hint under a new-password field. */
  hint: `At least ${passwordMinLength} characters.`,
  tooShort: `Use at least ${passwordMinLength} characters.`,
  tooLong: `Use at most ${passwordMaxLength} characters.`,
  /** The repeat field differs from the new password. */
  differ: 'The two passwords differ.',
} as const;

/** What a password form says before anything is sent; null when the new password is acceptable. */
export function newPasswordProblem(password: string): string | null {
  if (password.length < passwordMinLength) return passwordWords.tooShort;
  if (password.length > passwordMaxLength) return passwordWords.tooLong;
  return null;
}
