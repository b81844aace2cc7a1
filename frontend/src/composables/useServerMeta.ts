// What the server says about itself (GET /api/meta), asked once per page load and shared by the menu and
// the mailbox page. A failed probe counts as "no optional features" and is asked again on the next use.
import { ref, type Ref } from 'vue';
import { fetchMeta, type ServerMeta } from '@/api/mailbox';

const meta = ref<ServerMeta | null>(null);
let loading: Promise<void> | null = null;

export function useServerMeta(): { meta: Ref<ServerMeta | null>; load: () => Promise<void> } {
  function load(): Promise<void> {
    loading ??= fetchMeta().then(
      (answer) => {
        meta.value = answer;
      },
      () => {
        loading = null;
      },
    );
    return loading;
  }
  void load();
  return { meta, load };
}

/** Tests start each case from a server that has not been asked yet. */
export function resetServerMeta(): void {
  meta.value = null;
  loading = null;
}
