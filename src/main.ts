import { createApp } from 'vue';
import { createPinia } from 'pinia';
import '@fontsource/inter/400.css';
import '@fontsource/inter/500.css';
import '@fontsource/inter/600.css';
import '@fontsource/inter/700.css';
import { installElementPlus } from '@/plugins/elementPlus';
import '@/styles/theme.css';
import { setUnauthorizedHandler } from '@/api/http';
import { createAppRouter } from '@/router';
import { useAuthStore } from '@/stores/auth';
import { useTheme } from '@/composables/useTheme';
import App from './App.vue';

const app = createApp(App);
const pinia = createPinia();
app.use(pinia);
installElementPlus(app);
const router = createAppRouter();
app.use(router);
useTheme(); // applies the saved or system theme

// A 401 from a data call means the session ended (expired, signed out elsewhere, user disabled).
setUnauthorizedHandler(() => {
  useAuthStore(pinia).clear();
  const current = router.currentRoute.value;
  if (current.meta.public) return;
  void router.replace({ name: 'sign-in', query: { next: current.fullPath } });
});

void router.isReady().then(() => app.mount('#app'));
