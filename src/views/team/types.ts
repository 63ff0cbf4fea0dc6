import type { Role } from '@/api/types';

/** Fields of the invite and edit forms. */
export interface UserFormModel {
  name: string;
  email: string;
  roles: Role[];
}

/** The fields a server error may point at (other paths are shown as a form-level message). */
export const USER_FORM_FIELDS = ['name', 'email', 'roles'] as const;
