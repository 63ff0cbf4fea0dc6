import { computed, reactive, ref } from 'vue';
import { storeToRefs } from 'pinia';
import { useRoute, useRouter } from 'vue-router';
import type { FormInstance } from 'element-plus';
import { useAuthStore } from '@/stores/auth';
import { useHealthStore } from '@/stores/health';
import { homePathFor, safeNextPath } from '@/router/access';
import { errorMessage } from '@/utils/message';

/** The demo sign-ins (invented workshop on example.test), offered only where the Outbox is on. */
export const DEMO_ACCOUNTS = [
  { email: 'admin@example.test', label: 'Admin' },
  { email: 'designer@example.test', label: 'Designer' },
  { email: 'designer2@example.test', label: 'Designer (second)' },
  { email: 'reviewer@example.test', label: 'Reviewer' },
  { email: 'maker@example.test', label: 'Maker' },
] as const;

/** Password of every demo account. */
export const DEMO_PASSWORD = 'gantry-demo';

/**
 * State and actions of the sign-in page: validates the form, signs in, then goes to `?next=` (when it
 * is a path inside the app) or the user's start page. The API's message is shown inline.
 * @returns form state, `error` (message or ''), `isSubmitting`, `submit()`, demo helpers
 */
export function useSignIn() {
  const auth = useAuthStore();
  const health = useHealthStore();
  const { isOutboxEnabled } = storeToRefs(health);
  const router = useRouter();
  const route = useRoute();

  const formRef = ref<FormInstance>();
  const form = reactive({ email: '', password: '' });
  const error = ref('');
  const isSubmitting = ref(false);
  /** Demo sign-ins are listed only outside production (the same switch as the Outbox). */
  const isDemoShown = computed(() => isOutboxEnabled.value);

  void health.load();

  async function submit(): Promise<void> {
    error.value = '';
    const isValid = await formRef.value?.validate().catch(() => false);
    if (!isValid) return;
    isSubmitting.value = true;
    try {
      const user = await auth.signIn(form.email, form.password);
      await router.replace(safeNextPath(route.query.next) ?? homePathFor(user.roles));
    } catch (err) {
      error.value = errorMessage(err);
      form.password = '';
    } finally {
      isSubmitting.value = false;
    }
  }

  /** Fills the form with a demo account. */
  function fillDemoAccount(email: string): void {
    form.email = email;
    form.password = DEMO_PASSWORD;
    error.value = '';
    formRef.value?.clearValidate();
  }

  return { formRef, form, error, isSubmitting, isDemoShown, submit, fillDemoAccount };
}
