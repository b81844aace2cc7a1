// After a route change, focus moves to the new page's heading (its h1), so a screen reader announces
// the page and the next Tab starts at the top of its content, not somewhere in the old page's place.
// Not on the first load (the browser starts at the top, and the skip link must come first), and not
// when only the query changes (a filter in the address), which keeps focus on the control used.
import { nextTick } from 'vue';
import { START_LOCATION, type RouteLocationNormalized } from 'vue-router';

/** Waits up to `timeoutMs` for the page's h1 (views that load data draw it once the data is in). */
function whenHeading(timeoutMs: number): Promise<HTMLElement | null> {
  const find = () => document.querySelector<HTMLElement>('main h1') ?? document.querySelector<HTMLElement>('h1');
  const now = find();
  if (now) return Promise.resolve(now);
  return new Promise((resolve) => {
    const observer = new MutationObserver(() => {
      const found = find();
      if (found) finish(found);
    });
    const timer = setTimeout(() => finish(null), timeoutMs);
    function finish(el: HTMLElement | null): void {
      observer.disconnect();
      clearTimeout(timer);
      resolve(el);
    }
    observer.observe(document.body, { childList: true, subtree: true });
  });
}

/** Focuses the h1 (tabindex -1, so it takes focus without joining the Tab order); else main. */
export async function focusPageHeading(to: RouteLocationNormalized, from: RouteLocationNormalized): Promise<void> {
  if (from === START_LOCATION || from.matched.length === 0 || to.path === from.path) return;
  // afterEach runs before the new view is drawn: until the next tick, the h1 found is the old page's.
  await nextTick();
  const heading = await whenHeading(3000);
  const target = heading ?? document.querySelector<HTMLElement>('main');
  if (!target) return;
  if (!target.hasAttribute('tabindex')) target.setAttribute('tabindex', '-1');
  // Something the person chose meanwhile (they clicked into a field while the page loaded) wins.
  const active = document.activeElement;
  if (active && active !== document.body && document.querySelector('main')?.contains(active)) return;
  target.focus({ preventScroll: true });
}
