// Who is signed in, their club memberships and roles, and which club the screens act on. Shared by the
// router guards, the shell and most views, which is why it lives in Pinia.
import { computed, ref } from 'vue';
import { defineStore } from 'pinia';
import * as authApi from '@/api/auth';
import { forgetSession, forgetUser, keepSession, recallSession } from '@/api/kept';
import type { Membership, PreferredUnits, Role, SessionPayload, User } from '@/api/types';

export const CURRENT_CLUB_KEY = 'cagewright.currentClubId';

function readStoredClubId(): string | null {
  try {
    return globalThis.localStorage?.getItem(CURRENT_CLUB_KEY) ?? null;
  } catch {
    return null; // storage can be blocked; the first club is a fine default then
  }
}

function storeClubId(clubId: string | null): void {
  try {
    if (clubId === null) globalThis.localStorage?.removeItem(CURRENT_CLUB_KEY);
    else globalThis.localStorage?.setItem(CURRENT_CLUB_KEY, clubId);
  } catch {
    // not persisted; the choice still holds for this tab
  }
}

export const useSessionStore = defineStore('session', () => {
  const user = ref<User | null>(null);
  const memberships = ref<Membership[]>([]);
  const selectedClubId = ref<string | null>(readStoredClubId());
  let loading: Promise<void> | null = null;

  const isSignedIn = computed(() => user.value !== null);
  const preferredUnits = computed<PreferredUnits>(() => user.value?.preferredUnits ?? 'metric');
  /** The selected club if the user still belongs to it, else their first club, else none. */
  const currentMembership = computed<Membership | null>(
    () => memberships.value.find((m) => m.club.id === selectedClubId.value) ?? memberships.value[0] ?? null,
  );
  const currentClub = computed(() => currentMembership.value?.club ?? null);
  const currentRoles = computed<readonly Role[]>(() => currentMembership.value?.roles ?? []);

  function rolesIn(clubId: string): readonly Role[] {
    return memberships.value.find((m) => m.club.id === clubId)?.roles ?? [];
  }

  /** True when the user holds the role in any of their clubs. */
  function hasRole(role: Role): boolean {
    return memberships.value.some((m) => m.roles.includes(role));
  }

  function hasRoleInCurrentClub(role: Role): boolean {
    return currentRoles.value.includes(role);
  }

  function selectClub(clubId: string): void {
    if (!memberships.value.some((m) => m.club.id === clubId)) return;
    selectedClubId.value = clubId;
    storeClubId(clubId);
  }

  function setSession(payload: SessionPayload): void {
    user.value = payload.user;
    memberships.value = payload.memberships;
    loading = Promise.resolve();
    keepSession(payload);
  }

  /**
   * With no signal at start-up: who was signed in here last, so kept drafts and records can be offered.
   * The API still decides: its first answer after the signal returns may be a 401, which signs out.
   */
  function restoreKept(): boolean {
    const kept = recallSession<SessionPayload>();
    if (!kept?.value?.user) return false;
    user.value = kept.value.user;
    memberships.value = kept.value.memberships;
    loading = Promise.resolve(); // the first real answer (a 401 if the session ended) corrects it
    return true;
  }

  function setUser(next: User): void {
    user.value = next;
  }

  /** Forget the session locally (after sign-out, or when the API says it is gone). */
  function clear(): void {
    user.value = null;
    memberships.value = [];
    loading = Promise.resolve();
    forgetSession();
  }

  /** Asks the API once who is signed in; later calls reuse the answer. */
  function ensureLoaded(): Promise<void> {
    loading ??= authApi.fetchSession().then(
      (payload) => (payload ? setSession(payload) : clear()),
      (error: unknown) => {
        loading = null; // a failed probe (server down) is retried on the next navigation
        throw error;
      },
    );
    return loading;
  }

  /** Re-reads the session, e.g. after the user changed their own roles. */
  async function refresh(): Promise<void> {
    const payload = await authApi.fetchSession();
    if (payload) setSession(payload);
    else clear();
  }

  async function signIn(email: string, password: string): Promise<void> {
    setSession(await authApi.signIn(email, password));
  }

  /** Signs out, and forgets what this device kept for the user (drafts, records): laptops are shared. */
  async function signOut(): Promise<void> {
    const id = user.value?.id;
    try {
      await authApi.signOut();
    } finally {
      if (id) forgetUser(id);
      clear();
    }
  }

  return {
    user,
    memberships,
    selectedClubId,
    isSignedIn,
    preferredUnits,
    currentMembership,
    currentClub,
    currentRoles,
    rolesIn,
    hasRole,
    hasRoleInCurrentClub,
    selectClub,
    setSession,
    restoreKept,
    setUser,
    clear,
    ensureLoaded,
    refresh,
    signIn,
    signOut,
  };
});
