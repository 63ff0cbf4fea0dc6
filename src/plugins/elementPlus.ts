import type { App } from 'vue';
import { provideGlobalConfig, vLoading } from 'element-plus';
import en from 'element-plus/es/locale/lang/en';
import 'element-plus/dist/index.css';
import 'element-plus/theme-chalk/dark/css-vars.css';

/**
 * Sets up Element Plus for the whole app: English locale, default size, the loading directive,
 * and the library's stylesheet plus its dark-theme variables (our own values in styles/theme.css
 * are imported after this file and override them).
 *
 * Components are imported explicitly where they are used; nothing is registered globally,
 * so every Element Plus use can be found with a search.
 * @param app - the Vue application being set up
 */
export function installElementPlus(app: App): void {
  provideGlobalConfig({ locale: en, size: 'default', zIndex: 2000 }, app, true);
  app.directive('loading', vLoading);
}
