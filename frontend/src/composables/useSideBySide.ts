// The side-by-side page's data: the rulebooks the builder may compare with (each ticked when a class
// is known for it), the class picked per rulebook, and the matrix for the ticked ones. A rulebook with
// no class like the sheet's waits for the builder to pick one.
import { computed, ref, type Ref } from 'vue';
import type { UnitSystem } from '@domain/units';
import { compareSideBySide, getSideBySideOptions, type SideBySide, type SideBySideOptions } from '@/api/side-by-side';
import { ApiError, errorMessage } from '@/api/errors';

export interface Pick {
  checked: boolean;
  classId: string;
}

export function useSideBySide(sheetId: Ref<string>, units: Ref<UnitSystem>) {
  const options = ref<SideBySideOptions | null>(null);
  const picks = ref<Record<string, Pick>>({});
  const result = ref<SideBySide | null>(null);
  const loading = ref(false);
  const comparing = ref(false);
  const error = ref<string | null>(null);

  const chosen = computed(() => (options.value?.options ?? []).filter((o) => picks.value[o.rulesetVersionId]?.checked && picks.value[o.rulesetVersionId]?.classId));
  const missingClass = computed(() => (options.value?.options ?? []).filter((o) => picks.value[o.rulesetVersionId]?.checked && !picks.value[o.rulesetVersionId]?.classId));

  async function compare(): Promise<void> {
    if (chosen.value.length === 0) {
      result.value = null;
      return;
    }
    comparing.value = true;
    error.value = null;
    try {
      result.value = await compareSideBySide(sheetId.value, {
        columns: chosen.value.map((o) => ({ rulesetVersionId: o.rulesetVersionId, classId: picks.value[o.rulesetVersionId]!.classId })),
        unitSystem: units.value,
      });
    } catch (e) {
      const field = e instanceof ApiError ? Object.values(e.fieldErrors)[0] : undefined;
      error.value = field ? `${errorMessage(e)} ${field}.` : errorMessage(e);
    } finally {
      comparing.value = false;
    }
  }

  async function load(): Promise<void> {
    loading.value = true;
    error.value = null;
    result.value = null;
    try {
      options.value = await getSideBySideOptions(sheetId.value);
      picks.value = Object.fromEntries(options.value.options.map((o) => [o.rulesetVersionId, { checked: o.suggestedClassId !== null, classId: o.suggestedClassId ?? '' }]));
    } catch (e) {
      error.value = errorMessage(e);
      options.value = null;
    } finally {
      loading.value = false;
    }
    if (options.value) await compare();
  }

  return { options, picks, result, loading, comparing, error, chosen, missingClass, load, compare };
}
