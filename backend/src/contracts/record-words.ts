// The words for a cage record's status, in one place that the server (e-mails) and the client (the
// records page, a record's card, the public check) read. "Expires soon" is not a status of its own: a
// valid record whose expiry is within EXPIRY_NOTICE_DAYS is flagged, and its builder is mailed once.
// Plain data and small pure functions, safe for both sides.

export type RecordStatusKey = 'valid' | 'expired' | 'superseded' | 'revoked';
/** What the records page filters by: a status, or the valid records that expire soon. */
export type RecordShownKey = RecordStatusKey | 'expiring_soon';

/** Days before expiry from which a valid record is flagged and its builder reminded. */
export const EXPIRY_NOTICE_DAYS = 30;

export const RECORD_STATUS_WORDS: Readonly<Record<RecordShownKey, { label: string; severity: 'success' | 'warn' | 'secondary' | 'danger' }>> = {
  valid: { label: 'Valid', severity: 'success' },
  expiring_soon: { label: 'Expires soon', severity: 'warn' },
  expired: { label: 'Expired', severity: 'secondary' },
  superseded: { label: 'Superseded by a newer record', severity: 'secondary' },
  revoked: { label: 'Revoked', severity: 'danger' },
};

/** "expires today", "expires in 1 day", "expires in 12 days", "expired": whole days left, rounded down. */
export function expiryCountdownText(daysLeft: number): string {
  if (daysLeft < 0) return 'expired';
  if (daysLeft === 0) return 'expires today';
  return `expires in ${daysLeft} day${daysLeft === 1 ? '' : 's'}`;
}
