import { reactive, ref, watch } from 'vue';
import type { FormInstance } from 'element-plus';
import { isApiError } from '@/api/http';
import { errorMessage } from '@/utils/message';
import { USER_FORM_FIELDS, type UserFormModel } from './types';

/**
 * Form state shared by the invite and edit dialogs: client validation first, then the API call;
 * validation errors from the API are shown beside the field their `details.path` names (and a taken
 * e-mail address beside the e-mail field), anything else as one message above the form.
 * @param initial - produces the empty (or current) values when the dialog opens
 * @returns `formRef`, `form`, `fieldErrors`, `error`, `isSubmitting`, `reset(values?)` and `submit(action)`
 */
export function useUserForm(initial: () => UserFormModel) {
  const formRef = ref<FormInstance>();
  const form = reactive<UserFormModel>(initial());
  const fieldErrors = ref<Partial<Record<keyof UserFormModel, string>>>({});
  const error = ref('');
  const isSubmitting = ref(false);

  // A server message beside a field goes away as soon as the field is edited.
  for (const field of USER_FORM_FIELDS) {
    watch(
      () => form[field],
      () => {
        if (fieldErrors.value[field]) fieldErrors.value = { ...fieldErrors.value, [field]: '' };
      },
      { deep: true },
    );
  }

  function reset(values: UserFormModel = initial()): void {
    form.name = values.name;
    form.email = values.email;
    form.roles = [...values.roles];
    fieldErrors.value = {};
    error.value = '';
    formRef.value?.clearValidate();
  }

  async function submit<T>(action: () => Promise<T>): Promise<T | null> {
    error.value = '';
    fieldErrors.value = {};
    const isValid = await formRef.value?.validate().catch(() => false);
    if (!isValid) return null;
    isSubmitting.value = true;
    try {
      return await action();
    } catch (err) {
      if (isApiError(err) && err.code === 'email_taken') {
        fieldErrors.value = { email: err.message };
      } else if (isApiError(err) && err.details.length > 0) {
        const byPath = err.fieldErrors();
        const matched: Partial<Record<keyof UserFormModel, string>> = {};
        for (const field of USER_FORM_FIELDS) if (byPath[field]) matched[field] = byPath[field];
        fieldErrors.value = matched;
        if (Object.keys(matched).length === 0) error.value = err.message;
      } else {
        error.value = errorMessage(err);
      }
      return null;
    } finally {
      isSubmitting.value = false;
    }
  }

  return { formRef, form, fieldErrors, error, isSubmitting, reset, submit };
}
