// The live findings beside the editor: a short while after the builder stops typing, the draft is
// checked against the chosen class in the browser itself (the published ruleset document compiled by
// the same domain code the server runs), so there is no round trip and no server load. If the
// document cannot be fetched or compiled here, the server's dry-run check answers instead. The engine
// itself loads on the first check (liveEngine.ts), not with the page.
import { computed, onScopeDispose, ref, shallowRef, watch, type Ref } from 'vue';
import type { CompiledRuleset, UnitSystem } from '@domain/index';
import type { CheckReport } from '@contracts/report';
import type { FieldProblem } from '@contracts/specification';
import { getRulesetVersion } from '@/api/rulesets';
import { dryRunCheck } from '@/api/checks';
import { errorMessage } from '@/api/errors';
import { checkDraft, type SheetDraft } from './useBuildSheetDraft';
import { findingMarks } from '@/components/findings/findingMarks';

export const LIVE_CHECK_DELAY_MS = 300;

export type LiveStatus = 'idle' | 'checking' | 'ready' | 'invalid' | 'error';

export function useLiveFindings(
  draft: Ref<SheetDraft | null>,
  versionId: Ref<string | null>,
  classId: Ref<string | null>,
  units: Ref<UnitSystem>,
  delayMs = LIVE_CHECK_DELAY_MS,
) {
  const report = shallowRef<CheckReport | null>(null);
  const status = ref<LiveStatus>('idle');
  const problems = ref<FieldProblem[]>([]);
  const error = ref<string | null>(null);
  /** Where the last report came from: the browser, or the server when the browser could not. */
  const source = ref<'browser' | 'server' | null>(null);
  let compiled: Promise<CompiledRuleset | null> | null = null;
  let compiledFor: string | null = null;
  let timer: ReturnType<typeof setTimeout> | null = null;
  let run = 0;

  function compiledRuleset(id: string): Promise<CompiledRuleset | null> {
    if (compiledFor !== id || !compiled) {
      compiledFor = id;
      compiled = Promise.all([getRulesetVersion(id), import('./liveEngine')])
        .then(([version, engine]) => engine.compileRuleset(engine.rulesetDocumentSchema.parse(version.document)))
        .catch(() => {
          // The server answers this check instead; the next check tries the browser again (the
          // signal may be back by then).
          if (compiledFor === id) compiledFor = null;
          return null;
        });
    }
    return compiled;
  }

  async function check(): Promise<void> {
    const mine = ++run;
    const current = draft.value;
    if (!current || !versionId.value || !classId.value) return;
    const outcome = checkDraft({ ...current, vehicle: { ...current.vehicle, classId: classId.value } }, units.value);
    if (!outcome.ok) {
      problems.value = outcome.problems;
      status.value = 'invalid';
      return;
    }
    problems.value = [];
    status.value = 'checking';
    try {
      const ruleset = await compiledRuleset(versionId.value);
      let next: CheckReport;
      let from: 'browser' | 'server' = 'browser';
      try {
        if (!ruleset) throw new Error('no compiled ruleset');
        const { evaluateSpecification } = await import('./liveEngine');
        next = await evaluateSpecification(ruleset, classId.value, outcome.specification, { unitSystem: units.value });
      } catch {
        from = 'server';
        next = await dryRunCheck(versionId.value, classId.value, outcome.specification, units.value);
      }
      if (mine !== run) return; // a newer check started meanwhile
      report.value = next;
      source.value = from;
      error.value = null;
      status.value = 'ready';
    } catch (e) {
      if (mine !== run) return;
      error.value = errorMessage(e);
      status.value = 'error';
    }
  }

  function schedule(): void {
    if (timer) clearTimeout(timer);
    timer = setTimeout(() => {
      timer = null;
      void check();
    }, delayMs);
  }

  watch([draft, versionId, classId, units], schedule, { deep: true, immediate: true });
  onScopeDispose(() => {
    if (timer) clearTimeout(timer);
    run += 1;
  });

  /** Inputs to outline: none while the draft itself has problems (the report would be about old values). */
  // While a newer check runs, the last report's marks stay so the outlines do not flicker per keystroke.
  const marks = computed(() => (status.value === 'ready' || status.value === 'checking' ? findingMarks(report.value) : {}));

  return { report, status, problems, error, source, marks, checkNow: check };
}
