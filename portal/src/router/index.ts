import { createRouter, createWebHistory, type Router, type RouterHistory } from 'vue-router';
import { useSessionStore } from '../stores/session.store';
import { decideNavigation, pageTitle } from './decide-navigation';
import { routes } from './routes';

/** The router and its one guard. `history` is a parameter so tests can use memory history. */
export function createAppRouter(history: RouterHistory = createWebHistory()): Router {
  const router = createRouter({
    history,
    routes,
    scrollBehavior: (to, from, saved) => saved ?? (to.path === from.path ? undefined : { top: 0 }),
  });

  router.beforeEach(async (to) => {
    const session = useSessionStore();
    await session.load();
    const decision = decideNavigation(to, { signedIn: session.signedIn, roles: session.roles });
    switch (decision.kind) {
      case 'allow':
        return true;
      case 'sign-in':
        return { name: 'sign-in', query: { redirect: decision.redirect } };
      case 'not-allowed':
        return { name: 'not-allowed', query: { from: decision.from } };
      case 'go':
        return decision.path;
    }
  });

  router.afterEach((to) => {
    document.title = pageTitle(to.meta.title);
  });

  return router;
}
