// The main menu as data. Each entry names its route and, when it belongs to a club, the roles it needs in
// the current club. Adding a page to the menu is one line here.
import type { RouteLocationRaw } from 'vue-router';
import type { Role } from '@/api/types';
import type { RouteName } from '@/router/routes';

/** Optional parts of the server, reported by GET /api/meta; an entry naming one shows only while it is on. */
export type ServerFeature = 'mailbox';

export interface NavEntry {
  label: string;
  /** A PrimeIcons class. */
  icon: string;
  route: RouteName;
  /** Shown only to holders of one of these roles in the current club; the route gets `clubId`. */
  roles?: readonly Role[];
  feature?: ServerFeature;
}

export const navEntries: readonly NavEntry[] = [
  { label: 'Overview', icon: 'pi pi-gauge', route: 'home' },
  { label: 'Garage', icon: 'pi pi-car', route: 'garage', roles: ['builder'] },
  { label: 'Tube stock', icon: 'pi pi-box', route: 'tube-stock', roles: ['builder', 'admin'] },
  { label: 'Review queue', icon: 'pi pi-check-square', route: 'review-queue', roles: ['steward'] },
  { label: 'Cage records', icon: 'pi pi-id-card', route: 'club-records', roles: ['steward', 'admin'] },
  { label: 'Members', icon: 'pi pi-users', route: 'club-members', roles: ['admin'] },
  { label: 'Rulebooks', icon: 'pi pi-book', route: 'rulebooks', roles: ['admin'] },
  { label: 'Activity log', icon: 'pi pi-history', route: 'club-activity', roles: ['admin'] },
  { label: 'Mailbox', icon: 'pi pi-inbox', route: 'dev-mailbox', roles: ['admin'], feature: 'mailbox' },
  { label: 'Bench tools', icon: 'pi pi-wrench', route: 'fabrication' },
  { label: 'Account', icon: 'pi pi-user', route: 'account' },
];

export interface NavLink {
  label: string;
  icon: string;
  to: RouteLocationRaw;
}

/** The entries the current club's roles allow, with their links resolved for that club. */
export function visibleNavLinks(
  entries: readonly NavEntry[],
  clubId: string | null,
  roles: readonly Role[],
  features: ReadonlySet<ServerFeature> = new Set(),
): NavLink[] {
  return entries.flatMap((entry) => {
    if (entry.feature && !features.has(entry.feature)) return [];
    if (!entry.roles) return [{ label: entry.label, icon: entry.icon, to: { name: entry.route } }];
    if (clubId === null || !entry.roles.some((role) => roles.includes(role))) return [];
    return [{ label: entry.label, icon: entry.icon, to: { name: entry.route, params: { clubId } } }];
  });
}
