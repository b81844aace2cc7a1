// Mounts a view the way the app runs it: real router (in memory), a fresh Pinia, PrimeVue with its toast
// and confirmation services, unstyled so tests stay fast.
/* eslint-disable vue/one-component-per-file -- a test harness: a blank route stand-in and the host that mounts a view */
import { mount } from '@vue/test-utils';
import { createPinia, setActivePinia } from 'pinia';
import { createMemoryHistory, createRouter, type RouteRecordRaw } from 'vue-router';
import PrimeVue from 'primevue/config';
import ToastService from 'primevue/toastservice';
import ConfirmationService from 'primevue/confirmationservice';
import { defineComponent, h, type Component } from 'vue';
import ConfirmDialog from 'primevue/confirmdialog';
import Toast from 'primevue/toast';
import { routes } from '@/router/routes';

// The real route table (names, params, meta) with every page replaced by an empty stand-in: the view
// under test is mounted directly, and navigation away from it must not wait on lazy imports.
const Blank = defineComponent({ render: () => null });
function stubbed(records: readonly RouteRecordRaw[]): RouteRecordRaw[] {
  return records.map((record) => ({
    ...record,
    component: Blank,
    children: record.children ? stubbed(record.children) : undefined,
  })) as RouteRecordRaw[];
}

export async function mountAt(
  path: string,
  view: Component,
  setup?: (pinia: ReturnType<typeof createPinia>) => void,
) {
  const pinia = createPinia();
  setActivePinia(pinia);
  setup?.(pinia);
  const router = createRouter({ history: createMemoryHistory(), routes: stubbed(routes) });
  await router.push(path);
  await router.isReady();
  // The layout owns ConfirmDialog and Toast in the app; the harness provides them the same way.
  const Host = defineComponent({ render: () => [h(view), h(ConfirmDialog), h(Toast)] });
  const wrapper = mount(Host, {
    attachTo: document.body,
    global: { plugins: [pinia, router, [PrimeVue, { theme: 'none' }], ToastService, ConfirmationService] },
  });
  return { wrapper, router, pinia };
}

/** Lets pending promises and Vue's update queue run. */
export async function settle(): Promise<void> {
  for (let i = 0; i < 5; i += 1) await new Promise((resolve) => setTimeout(resolve, 0));
}
