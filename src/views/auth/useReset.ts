import { computed, reactive, ref, watch } from 'vue';
import { useRoute, useRouter } from 'vue-router';
import type { FormInstance } from 'element-plus';
import { resetPassword } from '@/api/auth';
import { isApiError } from '@/api/http';
import { useAuthStore } from '@/stores/auth';
import { homePathFor } from '@/router/access';
import { errorMessage, showSuccess } from '@/utils/message';
import { resetRules } from './rules';

/**
 * State and actions of the reset page, which serves two links: a password reset
 * (`/reset?token=…`) and an invitation (`/reset?token=…&invite=1`, "Set your password").
 * On success the server signs the user in and the page goes to their start page.
 * @returns form state, rules, `isInvite`, `hasToken`, `error`, `isTokenError`, `passwordError`, `isSubmitting` and `submit()`
 */
export function useReset() {
  const route = useRoute();
  const router = useRouter();
  const auth = useAuthStore();

  const token = computed(() => (typeof route.query.token === 'string' ? route.query.token : ''));
  const hasToken = computed(() => token.value.length > 0);
  const isInvite = computed(() => route.query.invite === '1');

  const formRef = ref<FormInstance>();
  const form = reactive({ password: '', confirm: '' });
  const rules = resetRules(() => form.password);
  const error = ref('');
  /** The server refused the link itself (unknown, expired or already used), not the password. */
  const isTokenError = ref(false);
  /** The server's complaint about the new password, shown beside the field. */
  const passwordError = ref('');
  const isSubmitting = ref(false);
  watch(
    () => form.password,
    () => {
      passwordError.value = '';
    },
  );

  async function submit(): Promise<void> {
    error.value = '';
    isTokenError.value = false;
    passwordError.value = '';
    const isValid = await formRef.value?.validate().catch(() => false);
    if (!isValid) return;
    isSubmitting.value = true;
    try {
      const { user } = await resetPassword(token.value, form.password);
      auth.setUser(user);
      showSuccess(isInvite.value ? `Welcome, ${user.name}. Your password is set.` : 'Your new password is set.');
      await router.replace(homePathFor(user.roles));
    } catch (err) {
      const onPassword = isApiError(err) ? err.fieldErrors().password : undefined;
      if (onPassword && isApiError(err) && err.details.every((d) => d.path === 'password')) passwordError.value = onPassword;
      else {
        error.value = errorMessage(err);
        isTokenError.value = isApiError(err) && err.status === 400 && !onPassword;
      }
    } finally {
      isSubmitting.value = false;
    }
  }

  return { formRef, form, rules, isInvite, hasToken, error, isTokenError, passwordError, isSubmitting, submit };
}
