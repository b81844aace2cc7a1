// Which member the drawing and the findings are about right now, shared by a page's drawing, its
// findings and its member rows without threading props through every level: `selectedId` is the
// member the builder clicked (its row opens, its findings show), `highlightId` the one a finding asked
// the drawing to show. Pages without a drawing provide nothing, and findings then offer no "show" button.
import { inject, provide, ref, type InjectionKey, type Ref } from 'vue';

export interface CageFocus {
  selectedId: Ref<string | null>;
  highlightId: Ref<string | null>;
  /** Member ids the drawing can show (has a path), so a finding only offers "show" when it can. */
  drawnIds: Ref<ReadonlySet<string>>;
  /** The builder's names of the members (memberNames), for words about the selection. */
  names: Ref<ReadonlyMap<string, string>>;
  select(memberId: string | null): void;
  highlight(memberId: string | null): void;
}

const KEY: InjectionKey<CageFocus> = Symbol('cage-focus');

export function provideCageFocus(onSelect?: (memberId: string) => void): CageFocus {
  const focus: CageFocus = {
    selectedId: ref(null),
    highlightId: ref(null),
    drawnIds: ref(new Set<string>()),
    names: ref(new Map<string, string>()),
    select(memberId) {
      focus.selectedId.value = memberId;
      focus.highlightId.value = memberId;
      if (memberId && onSelect) onSelect(memberId);
    },
    highlight(memberId) {
      focus.highlightId.value = focus.highlightId.value === memberId ? null : memberId;
    },
  };
  provide(KEY, focus);
  return focus;
}

export function useCageFocus(): CageFocus | null {
  return inject(KEY, null);
}
