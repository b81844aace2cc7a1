// The app's router: HTML5 history, the route table, the session guard, page titles and focus on the
// new page's heading after each navigation.
import { createRouter, createWebHistory } from 'vue-router';
import { routes } from './routes';
import { sessionGuard, setTitle } from './guards';
import { focusPageHeading } from './focus';

export type { RouteName } from './routes';

export const router = createRouter({
  history: createWebHistory(),
  routes,
  scrollBehavior: () => ({ top: 0 }),
});

router.beforeEach(sessionGuard);
router.afterEach(setTitle);
router.afterEach((to, from, failure) => {
  if (!failure) void focusPageHeading(to, from);
});
