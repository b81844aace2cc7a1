// When a caught mail arrived, in the reader's locale, the same way in the list and the message.
export function receivedAt(iso: string): string {
  return new Date(iso).toLocaleString(undefined, { dateStyle: 'medium', timeStyle: 'medium' });
}
