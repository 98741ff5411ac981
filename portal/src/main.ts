import '@fontsource/lato/400.css';
import '@fontsource/lato/700.css';
import 'primeicons/primeicons.css';
import './theme/base.css';

import { createPinia } from 'pinia';
import ConfirmationService from 'primevue/confirmationservice';
import PrimeVue from 'primevue/config';
import ToastService from 'primevue/toastservice';
import { createApp } from 'vue';
import { configureHttpClient } from './api/http-client';
import App from './app.vue';
import { initColorScheme } from './composables/use-color-scheme';
import { createAppRouter } from './router';
import { resetAllStores, resetPlugin } from './stores/reset-plugin';
import { useSessionStore } from './stores/session.store';
import { DARK_CLASS, LocalisPreset } from './theme/localis-preset';

initColorScheme();

const app = createApp(App);
const pinia = createPinia();
pinia.use(resetPlugin);
app.use(pinia);

const router = createAppRouter();
const session = useSessionStore(pinia);

configureHttpClient({
  csrfToken: () => session.csrfToken,
  // The session ended on the server (expired, signed out in another tab): start over at sign-in.
  onUnauthorized: () => {
    if (!session.signedIn) return;
    const redirect = router.currentRoute.value.fullPath;
    resetAllStores();
    void router.replace({ name: 'sign-in', query: { redirect, error: 'session_ended' } });
  },
});

app.use(router);
app.use(PrimeVue, {
  theme: { preset: LocalisPreset, options: { darkModeSelector: `.${DARK_CLASS}`, cssLayer: false } },
});
app.use(ToastService);
app.use(ConfirmationService);

void router.isReady().then(() => app.mount('#app'));
