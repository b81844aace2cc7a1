// Navigation guards. They only shape navigation for a pleasant flow; the API enforces every permission.
import type { RouteLocationNormalized, RouteLocationRaw } from 'vue-router';
import { useSessionStore } from '@/stores/session';
import { isUnreachable } from '@/api/http';

/** Only same-site paths may be used as a return path after signing in. */
export function safeRedirect(value: unknown): string | null {
  return typeof value === 'string' && value.startsWith('/') && !value.startsWith('//') ? value : null;
}

export async function sessionGuard(to: RouteLocationNormalized): Promise<true | RouteLocationRaw> {
  const session = useSessionStore();
  try {
    await session.ensureLoaded();
  } catch (error) {
    // No signal: whoever was signed in on this device last stays, so their pages show what was kept
    // and the offline banner, never the sign-in page. With nobody kept, sign-in shows the real error.
    if (isUnreachable(error)) session.restoreKept();
  }

  if (to.name === 'sign-in' && session.isSignedIn) {
    return safeRedirect(to.query.redirect) ?? { name: 'home' };
  }
  if (!to.meta.public && !session.isSignedIn) {
    return { name: 'sign-in', query: to.fullPath === '/' ? {} : { redirect: to.fullPath } };
  }
  const needed = to.meta.roles;
  if (needed && needed.length > 0) {
    const clubId = typeof to.params.clubId === 'string' ? to.params.clubId : null;
    const held = clubId ? session.rolesIn(clubId) : session.currentRoles;
    if (!needed.some((role) => held.includes(role))) return { name: 'home' };
  }
  return true;
}

export function setTitle(to: RouteLocationNormalized): void {
  document.title = to.meta.title ? `${to.meta.title} · Cagewright` : 'Cagewright';
}
