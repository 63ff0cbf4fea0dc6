import { computed, ref } from 'vue';
import { defineStore } from 'pinia';
import { fetchHealth, type Health } from '@/api/health';
import { isApiError } from '@/api/http';

function asHealth(body: unknown): Partial<Health> {
  return typeof body === 'object' && body !== null ? (body as Partial<Health>) : {};
}

/**
 * The server's health and feature flags (`GET /api/health`), read once per page load.
 * Drives the Outbox navigation item (shown only where the server keeps caught e-mails)
 * and the version shown in the sidebar.
 */
export const useHealthStore = defineStore('health', () => {
  /** Last answer, or null before the first one arrives or when the server could not be reached. */
  const health = ref<Health | null>(null);
  let pending: Promise<void> | null = null;

  /** true when the Outbox screen is available (development and test). */
  const isOutboxEnabled = computed(() => health.value?.outbox === true);
  /** Server version, when reported. */
  const version = computed(() => health.value?.version ?? '');
  /** true when the server answered but reported a problem (e.g. database down). */
  const isDegraded = computed(() => health.value?.status === 'degraded');

  /**
   * Reads the health endpoint once (later calls reuse it unless `force`). Never throws: a 503
   * answer is kept as a degraded status, an unreachable server leaves `health` null.
   */
  async function load(options: { force?: boolean } = {}): Promise<void> {
    if (health.value && !options.force) return;
    if (pending && !options.force) return pending;
    pending = (async () => {
      try {
        health.value = await fetchHealth();
      } catch (err) {
        // 503 still carries the health body (database down); keep its flags.
        health.value =
          isApiError(err) && err.status === 503
            ? { status: 'degraded', db: 'down', version: '', outbox: false, ...asHealth(err.body) }
            : null;
      } finally {
        pending = null;
      }
    })();
    return pending;
  }

  return { health, isOutboxEnabled, version, isDegraded, load };
});
