import { flushPromises, mount } from '@vue/test-utils';
import { createPinia, setActivePinia } from 'pinia';
import ConfirmationService from 'primevue/confirmationservice';
import ConfirmDialog from 'primevue/confirmdialog';
import PrimeVue from 'primevue/config';
import Toast from 'primevue/toast';
import ToastService from 'primevue/toastservice';
import { vi } from 'vitest';
import { defineComponent, h, type Component } from 'vue';
import { createMemoryHistory, createRouter, RouterView, type RouteComponent, type Router } from 'vue-router';

export interface MountInAppOptions {
  /** The router to install; it is moved to `path` (default '/') before mounting. */
  router?: Router;
  path?: string;
  /** Runs once the stores can be used, before mounting: to sign someone in, say. */
  beforeMount?: () => void;
}

/**
 * Mounts a component with what main.ts gives the app: a fresh Pinia, PrimeVue without a theme,
 * the Toast and Confirmation services and the router when there is one. It is attached to the
 * document with teleports kept in place, so dialogs are found inside it, and its first requests
 * have settled when the promise resolves.
 */
export async function mountInApp(component: Component, options: MountInAppOptions = {}) {
  const { router, path = '/', beforeMount } = options;
  if (router) {
    await router.push(path);
    await router.isReady();
  }
  const pinia = createPinia();
  setActivePinia(pinia);
  beforeMount?.();
  const wrapper = mount(component, {
    global: {
      plugins: [pinia, ...(router ? [router] : []), [PrimeVue, { theme: 'none' }], ToastService, ConfirmationService],
      stubs: { teleport: true },
    },
    attachTo: document.body,
  });
  await flushPromises();
  return wrapper;
}

/** A route of a test router: the page under test, or (without a component) a blank page links can name. */
export interface TestRoute {
  path: string;
  name?: string;
  component?: RouteComponent;
  props?: boolean;
}

const BLANK_PAGE = defineComponent({ name: 'BlankPage', render: () => h('div') });

/** A router on memory history, for a test. */
export function memoryRouter(routes: TestRoute[]): Router {
  return createRouter({ history: createMemoryHistory(), routes: routes.map((r) => ({ ...r, component: r.component ?? BLANK_PAGE })) });
}

/** What app.vue renders around every page: the page itself, the toasts and the confirmation dialog. */
const AppOutlet = defineComponent({ name: 'AppOutlet', render: () => [h(Toast), h(ConfirmDialog), h(RouterView)] });

/** Mounts the page the router shows at `path`, as the app would (see `mountInApp`). */
export function mountPage(router: Router, path: string, beforeMount?: () => void) {
  return mountInApp(AppOutlet, { router, path, beforeMount });
}

/** Undoes what a test set up: the stubbed fetch and whatever was mounted into the document. */
export function resetTestPage(): void {
  vi.unstubAllGlobals();
  document.body.innerHTML = '';
}
