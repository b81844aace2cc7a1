// The cage views of what is on screen: the draft (or a saved specification) and its findings, drawn
// by the same domain function the PDF uses. Recomputed whenever the model, a size or a finding
// changes, so a node moved in the table redraws at once.
import { computed, type Ref } from 'vue';
import { drawCage, type CageSpecLike } from '@domain/geometry/cage-drawing';
import type { UnitSystem } from '@domain/units';
import type { Finding } from '@contracts/report';

export function useCageDrawing(
  spec: Ref<CageSpecLike | null>,
  findings: Ref<readonly Finding[]>,
  units: Ref<UnitSystem>,
  highlightId: Ref<string | null>,
  waivedKeys?: Ref<ReadonlySet<string>>,
) {
  const drawing = computed(() =>
    spec.value ? drawCage({ spec: spec.value, findings: findings.value, units: units.value, highlightId: highlightId.value, waivedKeys: waivedKeys?.value }) : null,
  );
  const drawnIds = computed<ReadonlySet<string>>(() => new Set(drawing.value?.drawn.map((d) => d.id) ?? []));
  return { drawing, drawnIds };
}
