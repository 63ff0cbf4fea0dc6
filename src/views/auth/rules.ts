import type { FormItemRule, FormRules } from 'element-plus';

/**
 * Client-side checks for the sign-in, forgot and reset forms. They save a round trip; the server
 * checks everything again and its messages are shown as they come.
 */

/** Shortest password the server accepts (its policy: server/security/passwordPolicy.ts). */
export const PASSWORD_MIN_LENGTH = 12;
/** The rest of the policy, which only the server can check (it holds the list of common passwords). */
export const PASSWORD_POLICY_HINT = 'Not a common password, and not your name or e-mail address.';
/** Longest password the server accepts, in UTF-8 bytes (longer ones would not fully count). */
export const PASSWORD_MAX_BYTES = 72;

const EMAIL_RULES: FormItemRule[] = [
  { required: true, message: 'Enter your e-mail address.', trigger: 'blur' },
  { type: 'email', message: 'That does not look like an e-mail address.', trigger: 'blur' },
];

/** Sign-in: e-mail and password. */
export const signInRules: FormRules = {
  email: EMAIL_RULES,
  password: [{ required: true, message: 'Enter your password.', trigger: 'blur' }],
};

/** Forgot password: e-mail only. */
export const forgotRules: FormRules = {
  email: EMAIL_RULES,
};

/**
 * Reset or first password: the new password twice.
 * @param getPassword - reads the first field, so the confirmation can be compared with it
 */
export function resetRules(getPassword: () => string): FormRules {
  return {
    password: [
      { required: true, message: 'Choose a password.', trigger: 'blur' },
      {
        validator: (_rule, value: string, callback) => {
          if ([...(value ?? '')].length < PASSWORD_MIN_LENGTH) callback(new Error(`Use at least ${PASSWORD_MIN_LENGTH} characters.`));
          else callback();
        },
        trigger: 'blur',
      },
      {
        validator: (_rule, value: string, callback) => {
          if (new TextEncoder().encode(value ?? '').length > PASSWORD_MAX_BYTES)
            callback(new Error(`Use at most ${PASSWORD_MAX_BYTES} bytes (about ${PASSWORD_MAX_BYTES} plain letters).`));
          else callback();
        },
        trigger: 'blur',
      },
    ],
    confirm: [
      { required: true, message: 'Type the password again.', trigger: 'blur' },
      {
        validator: (_rule, value: string, callback) => {
          if (value !== getPassword()) callback(new Error('The two passwords differ.'));
          else callback();
        },
        trigger: 'blur',
      },
    ],
  };
}
