// The members page's data: one club's members, loaded when the club changes, and the calls that change
// them. Errors are thrown to the caller, which knows how to word them.
import { ref, watch, type Ref } from 'vue';
import * as clubsApi from '@/api/clubs';
import { errorMessage } from '@/api/errors';
import type { AddMemberResult, ClubMember, Role } from '@/api/types';

export function useClubMembers(clubId: Ref<string>) {
  const members = ref<ClubMember[]>([]);
  const loading = ref(false);
  const loadError = ref<string | null>(null);

  async function load(): Promise<void> {
    loading.value = true;
    loadError.value = null;
    try {
      members.value = await clubsApi.listMembers(clubId.value);
    } catch (error) {
      members.value = [];
      loadError.value = errorMessage(error);
    } finally {
      loading.value = false;
    }
  }

  async function add(email: string, roles: Role[]): Promise<AddMemberResult> {
    const result = await clubsApi.addMember(clubId.value, email, roles);
    members.value = [...members.value.filter((m) => m.user.id !== result.member.user.id), result.member];
    return result;
  }

  async function setRoles(userId: string, roles: Role[]): Promise<void> {
    const updated = await clubsApi.updateMemberRoles(clubId.value, userId, roles);
    members.value = members.value.map((m) => (m.user.id === userId ? updated : m));
  }

  async function remove(userId: string): Promise<void> {
    await clubsApi.removeMember(clubId.value, userId);
    members.value = members.value.filter((m) => m.user.id !== userId);
  }

  watch(clubId, load, { immediate: true });

  return { members, loading, loadError, load, add, setRoles, remove };
}
