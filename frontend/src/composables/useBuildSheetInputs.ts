// What the sheet's inputs share with the editor around them: the draft itself, the units on screen, messages per input
// path (the draft's own checks, the server's field errors), live findings marks, and the parse errors
// of text that is not a number yet, which block a save because the draft cannot see that text.
import { computed, inject, provide, reactive, ref, type ComputedRef, type InjectionKey, type Ref } from 'vue';
import type { UnitSystem } from '@domain/index';
import type { CageDrawing } from '@domain/geometry/cage-drawing';
import type { InputMark } from '@/components/findings/findingMarks';
import { emptyDraft, type SheetDraft } from './useBuildSheetDraft';
import type { TypedText } from './useKeptDraft';

export interface SheetInputs {
  /** The draft the sections edit in place (shared, not passed down as a prop to mutate). */
  draft: Ref<SheetDraft>;
  units: ComputedRef<UnitSystem>;
  /** Messages by path (`members.0.wallMm`): the draft's checks and the server's field errors. */
  errors: ComputedRef<Record<string, string>>;
  marks: ComputedRef<Record<string, InputMark>>;
  parseErrors: Record<string, string>;
  setParseError(path: string, message: string | null): void;
  /** What the cage model gives per member id (length, side), so those inputs are not asked for. */
  modelled: ComputedRef<CageDrawing['modelled']>;
  /** The geometry facts the model derives (the values the rules read), likewise not asked for. */
  modelFacts: ComputedRef<CageDrawing['facts']>;
  /** The raw text typed into each number input, by path: kept on the device with the draft. */
  typed: Record<string, TypedText>;
}

const KEY: InjectionKey<SheetInputs> = Symbol('sheet-inputs');

export function provideSheetInputs(
  draft: Ref<SheetDraft>,
  units: ComputedRef<UnitSystem>,
  errors: ComputedRef<Record<string, string>>,
  marks: ComputedRef<Record<string, InputMark>>,
  modelled: ComputedRef<CageDrawing['modelled']> = computed(() => new Map()),
  modelFacts: ComputedRef<CageDrawing['facts']> = computed(() => ({})),
  typed: Record<string, TypedText> = reactive({}),
): SheetInputs {
  const parseErrors = reactive<Record<string, string>>({});
  const inputs: SheetInputs = {
    draft,
    units,
    errors,
    marks,
    modelled,
    modelFacts,
    typed,
    parseErrors,
    setParseError(path, message) {
      if (message === null) delete parseErrors[path];
      else parseErrors[path] = message;
    },
  };
  provide(KEY, inputs);
  return inputs;
}

/** Inputs used outside an editor (a dialog, a test) get metric, no messages and no marks. */
export function useSheetInputs(): SheetInputs {
  return (
    inject(KEY, null) ?? {
      draft: ref(emptyDraft('none')),
      units: computed(() => 'metric' as const),
      errors: computed(() => ({})),
      marks: computed(() => ({})),
      modelled: computed(() => new Map()),
      modelFacts: computed(() => ({})),
      typed: {},
      parseErrors: {},
      setParseError: () => undefined,
    }
  );
}
