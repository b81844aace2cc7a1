// Opening a member's row from outside the list (a click in the drawing): the Members section opens,
// the row scrolls into view, is outlined for a moment, and its first input takes the focus.
import { nextTick } from 'vue';

export const memberRowId = (memberId: string): string => `member-row-${memberId}`;

export async function openMemberRow(memberId: string): Promise<void> {
  await nextTick();
  const row = document.getElementById(memberRowId(memberId));
  if (!row) return;
  const section = row.closest('details');
  if (section && !section.open) section.open = true;
  row.scrollIntoView?.({ block: 'center', behavior: 'smooth' });
  row.classList.add('cw-sheet-row--picked');
  setTimeout(() => row.classList.remove('cw-sheet-row--picked'), 2400);
  row.querySelector<HTMLElement>('input, select')?.focus({ preventScroll: true });
}
