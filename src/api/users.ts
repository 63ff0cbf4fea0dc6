import { get, patch, post } from './http';
import type { Page, PageQuery, Role, User } from './types';

/** Fields of an invitation. */
export interface InviteUserInput {
  name: string;
  email: string;
  roles: Role[];
}

/** Fields an admin may change on a user. */
export interface UpdateUserInput {
  name?: string;
  roles?: Role[];
  disabled?: boolean;
}

/** Lists users, newest first (admin). `q` matches name or e-mail. */
export const listUsers = (query: PageQuery = {}): Promise<Page<User>> => get('/users', { ...query });

/** Creates a user and e-mails them a set-password link (admin). */
export const inviteUser = (input: InviteUserInput): Promise<{ user: User }> => post('/users', input);

/** Changes name, roles or the disabled flag of a user (admin). */
export const updateUser = (id: number, input: UpdateUserInput): Promise<{ user: User }> => patch(`/users/${id}`, input);
