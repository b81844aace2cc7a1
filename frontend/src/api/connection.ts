// Whether the server can be reached, as the app last saw it. The API client reports each answer here:
// no answer at all (network error, timeout) or a gateway's 502/503/504 means "unreachable", any answer
// from the server itself means "reachable". While unreachable, a light probe asks /api/health now and
// then, so the offline banner clears on its own once the server answers again, without a click.
import { ref } from 'vue';

/** True while the last request found the server unreachable. */
export const serverUnreachable = ref(false);
/** When the server was first found unreachable in this spell (ms since the epoch), else null. */
export const unreachableSince = ref<number | null>(null);

/** Statuses a proxy or load balancer answers for a server that is down or restarting. */
const GATEWAY_STATUSES = new Set([502, 503, 504]);

export function isGatewayStatus(status: number): boolean {
  return GATEWAY_STATUSES.has(status);
}

let probeTimer: ReturnType<typeof setTimeout> | null = null;
let probe: (() => Promise<boolean>) | null = null;
export const PROBE_INTERVAL_MS = 8000;

/** How the app asks whether the server is back (set once by http.ts; tests set their own). */
export function setProbe(next: (() => Promise<boolean>) | null): void {
  probe = next;
}

export function reportUnreachable(): void {
  if (!serverUnreachable.value) unreachableSince.value = Date.now();
  serverUnreachable.value = true;
  scheduleProbe();
}

export function reportReachable(): void {
  serverUnreachable.value = false;
  unreachableSince.value = null;
  if (probeTimer !== null) clearTimeout(probeTimer);
  probeTimer = null;
}

function scheduleProbe(): void {
  if (probeTimer !== null || !probe) return;
  probeTimer = setTimeout(() => {
    probeTimer = null;
    // The probe goes through the client, which reports what it found; schedule again if still down.
    void probe?.().then((ok) => {
      if (!ok && serverUnreachable.value) scheduleProbe();
    });
  }, PROBE_INTERVAL_MS);
}

// The browser's own word helps both ways: "offline" is certain, "online" is worth asking at once.
if (typeof window !== 'undefined') {
  window.addEventListener('offline', () => reportUnreachable());
  window.addEventListener('online', () => void probe?.());
}
