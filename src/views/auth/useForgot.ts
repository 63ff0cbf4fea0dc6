import { reactive, ref } from 'vue';
import type { FormInstance } from 'element-plus';
import { requestPasswordReset } from '@/api/auth';
import { errorMessage } from '@/utils/message';

/**
 * State and actions of the forgot-password page. The server answers the same whether or not the
 * address has an account, so the page always shows the same "check your inbox" state afterwards.
 * @returns form state, `error`, `isSubmitting`, `sentTo` (address after success) and `submit()`
 */
export function useForgot() {
  const formRef = ref<FormInstance>();
  const form = reactive({ email: '' });
  const error = ref('');
  const isSubmitting = ref(false);
  const sentTo = ref('');

  async function submit(): Promise<void> {
    error.value = '';
    const isValid = await formRef.value?.validate().catch(() => false);
    if (!isValid) return;
    isSubmitting.value = true;
    try {
      await requestPasswordReset(form.email.trim());
      sentTo.value = form.email.trim();
    } catch (err) {
      error.value = errorMessage(err);
    } finally {
      isSubmitting.value = false;
    }
  }

  function startOver(): void {
    sentTo.value = '';
    error.value = '';
  }

  return { formRef, form, error, isSubmitting, sentTo, submit, startOver };
}
