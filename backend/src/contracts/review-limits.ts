// How long the steward's written words must and may be, in one place: the review workflow and cage
// records (domain/review), the wire schemas (contracts/review.ts) and the review screens read these.
// Plain numbers, no zod, so the domain can import them.

/** A note asking for changes, or the reason for rejecting. */
export const NOTE_MIN = 10;
export const NOTE_MAX = 4000;
/** The written reason for accepting a finding that is not met. */
export const WAIVER_REASON_MIN = 10;
export const WAIVER_REASON_MAX = 2000;
/** The reason for revoking an issued cage record. */
export const REVOKE_REASON_MIN = 10;
export const REVOKE_REASON_MAX = 2000;
