// The tube chooser's data for a sheet: the choice itself, and putting a chosen size on the sheet as a
// new revision after the builder confirms (with the members the choice changes too), with an undo that
// restores the revision it was made from. Reloads the choice after each change.
import { ref, type Ref } from 'vue';
import { useConfirm } from 'primevue/useconfirm';
import type { UnitSystem } from '@domain/units';
import { applyTubeChoice, getTubeChoice, restoreRevision, type TubeCandidate, type TubeChoice, type TubeChoiceApplied, type MemberTubeChoice } from '@/api/tube-stock';
import { ApiError, errorMessage } from '@/api/errors';
import { sizeText, stuffText } from '@/components/tubes/tubeText';

export interface AppliedNotice {
  applied: TubeChoiceApplied;
  /** Set once undone: the revision that restored the earlier tubes. */
  undoneAs?: number;
}

const messageOf = (e: unknown) => (e instanceof ApiError ? (e.fieldError('stockId') ?? e.fieldError('memberId') ?? e.fieldError('baseRevision') ?? e.message) : errorMessage(e));

export function useTubeChoice(sheetId: Ref<string>, anyMaterial: Ref<boolean>, units: Ref<UnitSystem>) {
  const confirm = useConfirm();
  const choice = ref<TubeChoice | null>(null);
  const loading = ref(false);
  const busy = ref(false);
  const error = ref<string | null>(null);
  const notice = ref<AppliedNotice | null>(null);

  async function load(): Promise<void> {
    loading.value = true;
    error.value = null;
    try {
      choice.value = await getTubeChoice(sheetId.value, anyMaterial.value);
    } catch (e) {
      error.value = errorMessage(e);
    } finally {
      loading.value = false;
    }
  }

  async function put(member: MemberTubeChoice, c: TubeCandidate): Promise<void> {
    const base = choice.value!.revision;
    busy.value = true;
    error.value = null;
    try {
      notice.value = { applied: await applyTubeChoice(sheetId.value, { baseRevision: base, memberId: member.memberId, stockId: c.stockId!, anyMaterial: anyMaterial.value }) };
      await load();
    } catch (e) {
      error.value = messageOf(e);
    } finally {
      busy.value = false;
    }
  }

  /** Asks first: the sheet gets a new revision, and every member the choice changes is named. */
  function use(member: MemberTubeChoice, c: TubeCandidate): void {
    const name = member.label || member.memberId;
    const also = c.together.map((t) => `${t.memberName} to ${sizeText(t.candidate.odMm, t.candidate.wallMm, units.value)}`);
    confirm.require({
      header: 'Put this tube on the sheet',
      message: `${name}: ${sizeText(c.odMm, c.wallMm, units.value)} ${stuffText(c)}${also.length ? `, with ${also.join(' and ')} so the sheet stays legal` : ''}. `
        + `This saves revision ${choice.value!.revision + 1} of the build sheet; you can undo it. Check the sheet again before you buy tube.`,
      icon: 'pi pi-check-square',
      acceptProps: { label: 'Put it on the sheet' },
      rejectProps: { label: 'Cancel', severity: 'secondary', outlined: true },
      accept: () => put(member, c),
    });
  }

  async function undo(): Promise<void> {
    const n = notice.value;
    if (!n || n.undoneAs !== undefined) return;
    busy.value = true;
    error.value = null;
    try {
      const detail = await restoreRevision(sheetId.value, n.applied.previousRevision, n.applied.revision);
      notice.value = { ...n, undoneAs: detail.revision.number };
      await load();
    } catch (e) {
      error.value = messageOf(e);
    } finally {
      busy.value = false;
    }
  }

  return { choice, loading, busy, error, notice, load, use, undo };
}
