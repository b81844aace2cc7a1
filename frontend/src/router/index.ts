// The app's router: HTML5 history, the route table, the session guard and page titles.
import { createRouter, createWebHistory } from 'vue-router';
import { routes } from './routes';
import { sessionGuard, setTitle } from './guards';

export type { RouteName } from './routes';

export const router = createRouter({
  history: createWebHistory(),
  routes,
  scrollBehavior: () => ({ top: 0 }),
});

router.beforeEach(sessionGuard);
router.afterEach(setTitle);
