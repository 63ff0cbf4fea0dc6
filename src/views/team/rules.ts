import type { FormRules } from 'element-plus';

/** Checks for the invite and edit forms (the server checks again and its messages win). */
export const userFormRules: FormRules = {
  name: [
    { required: true, message: 'Enter the person’s name.', trigger: 'blur' },
    { max: 120, message: 'Use at most 120 characters.', trigger: 'blur' },
  ],
  email: [
    { required: true, message: 'Enter an e-mail address.', trigger: 'blur' },
    { type: 'email', message: 'That does not look like an e-mail address.', trigger: 'blur' },
  ],
  roles: [{ type: 'array', required: true, min: 1, message: 'Pick at least one role.', trigger: 'change' }],
};
