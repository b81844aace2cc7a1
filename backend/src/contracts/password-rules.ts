// The password rules, in one place: the API's schemas (contracts/auth.ts) and every password form of
// the front end (sign-up by invitation, change, reset) read these. No zod here, so a small public page
// can import it without the schema library.
export const passwordMinLength = 10;
export const passwordMaxLength = 200;

/** What a password form says before anything is sent; null when the new password is acceptable. */
export function newPasswordProblem(password: string): string | null {
  if (password.length < passwordMinLength) return `Use at least ${passwordMinLength} characters.`;
  if (password.length > passwordMaxLength) return `Use at most ${passwordMaxLength} characters.`;
  return null;
}
