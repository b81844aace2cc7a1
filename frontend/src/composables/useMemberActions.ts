// What an admin does on the members page: add, change roles, remove (after a confirmation), with each
// refusal worded for people. Changing one's own roles re-reads the session, and losing admin leaves the page.
import { ref, type ComputedRef } from 'vue';
import { useRouter } from 'vue-router';
import { useConfirm } from 'primevue/useconfirm';
import { useToast } from 'primevue/usetoast';
import { ApiError, errorMessage } from '@/api/errors';
import type { ClubMember, Role } from '@/api/types';
import type { useClubMembers } from '@/composables/useClubMembers';
import { useSessionStore } from '@/stores/session';

export const LAST_ADMIN =
  'A club needs at least one admin. Give another member the admin role first, then try again.';

export function useMemberActions(
  clubId: ComputedRef<string>,
  clubName: ComputedRef<string>,
  data: ReturnType<typeof useClubMembers>,
) {
  const router = useRouter();
  const session = useSessionStore();
  const confirm = useConfirm();
  const toast = useToast();
  const { members, add, setRoles, remove } = data;

  const actionError = ref<string | null>(null);
  const busyUserId = ref<string | null>(null);
  const adding = ref(false);
  const addErrors = ref<Record<string, string>>({});
  const invitation = ref<{ email: string; url: string; mailed: boolean } | null>(null);

  const describe = (error: unknown) =>
    error instanceof ApiError && error.code === 'conflict' ? LAST_ADMIN : errorMessage(error);
  const nameOf = (member: ClubMember) => member.user.displayName || member.user.email;

  async function afterOwnChange(userId: string): Promise<void> {
    if (userId !== session.user?.id) return;
    await session.refresh();
    if (!session.rolesIn(clubId.value).includes('admin')) await router.replace({ name: 'home' });
  }

  async function onAdd(email: string, roles: Role[], done: () => void): Promise<void> {
    adding.value = true;
    addErrors.value = {};
    actionError.value = null;
    try {
      const result = await add(email, roles);
      done();
      invitation.value = result.invitationUrl
        ? { email, url: result.invitationUrl, mailed: result.invitationMailed === true }
        : null;
      toast.add({ severity: 'success', summary: `${email} added to ${clubName.value}`, life: 3000 });
    } catch (error) {
      if (error instanceof ApiError) addErrors.value = { ...error.fieldErrors };
      actionError.value = errorMessage(error);
    } finally {
      adding.value = false;
    }
  }

  async function onChangeRoles(member: ClubMember, roles: Role[]): Promise<void> {
    actionError.value = null;
    const snapBack = () =>
      (members.value = members.value.map((m) => (m === member ? { ...m, roles: [...m.roles] } : m)));
    if (roles.length === 0) {
      actionError.value =
        'A member needs at least one role. To take someone out of the club, remove them instead.';
      snapBack();
      return;
    }
    busyUserId.value = member.user.id;
    try {
      await setRoles(member.user.id, roles);
      await afterOwnChange(member.user.id);
    } catch (error) {
      actionError.value = describe(error);
      snapBack();
    } finally {
      busyUserId.value = null;
    }
  }

  function onRemove(member: ClubMember): void {
    actionError.value = null;
    confirm.require({
      header: 'Remove member',
      message: `Remove ${nameOf(member)} from ${clubName.value}? They lose every role in this club.`,
      icon: 'pi pi-exclamation-triangle',
      acceptProps: { label: 'Remove', severity: 'danger' },
      rejectProps: { label: 'Cancel', severity: 'secondary', outlined: true },
      accept: async () => {
        busyUserId.value = member.user.id;
        try {
          await remove(member.user.id);
          toast.add({ severity: 'success', summary: `${nameOf(member)} removed`, life: 3000 });
          await afterOwnChange(member.user.id);
        } catch (error) {
          actionError.value = describe(error);
        } finally {
          busyUserId.value = null;
        }
      },
    });
  }

  return { actionError, busyUserId, adding, addErrors, invitation, onAdd, onChangeRoles, onRemove };
}
