// Application entry: installs PrimeVue once with Cagewright's own theme, Pinia and the router, and
// routes every "not signed in" answer from the API through one handler.
import { createApp } from 'vue';
import { createPinia } from 'pinia';
import PrimeVue from 'primevue/config';
import ToastService from 'primevue/toastservice';
import ConfirmationService from 'primevue/confirmationservice';
import '@fontsource/noto-sans/400.css';
import '@fontsource/noto-sans/500.css';
import '@fontsource/noto-sans/600.css';
import '@fontsource/noto-sans/700.css';
import 'primeicons/primeicons.css';
import './assets/base.css';
import App from './App.vue';
import { router } from './router';
import { http } from './api/http';
import { useSessionStore } from './stores/session';
import { CagewrightPreset } from './theme/preset';

const app = createApp(App);
const pinia = createPinia();
app.use(pinia);
app.use(router);
app.use(PrimeVue, {
  theme: { preset: CagewrightPreset, options: { darkModeSelector: false, cssLayer: false } },
});
app.use(ToastService);
app.use(ConfirmationService);

http.onUnauthenticated(() => {
  const session = useSessionStore(pinia);
  session.clear();
  const current = router.currentRoute.value;
  if (current.meta.public) return;
  void router.replace({ name: 'sign-in', query: { redirect: current.fullPath } });
});

app.mount('#app');

// The app-shell cache (vite.config.ts): production builds only, so the dev server and its hot reload
// never meet a cached file. Scoped to the whole app; the worker leaves /api to the network.
if (import.meta.env.PROD && 'serviceWorker' in navigator) {
  window.addEventListener('load', () => void navigator.serviceWorker.register('/sw.js', { scope: '/' }).catch(() => undefined));
}
