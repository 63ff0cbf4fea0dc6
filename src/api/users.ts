import type { InviteUserBody, UpdateUserBody, UserListQuery } from '@/contracts';
import { get, patch, post } from './http';
import type { Page, User } from './types';

/** Lists users, newest first (admin). `q` matches name or e-mail. */
export const listUsers = (query: UserListQuery = {}): Promise<Page<User>> => get('/users', { ...query });

/** Creates a user and e-mails them a set-password link (admin). */
export const inviteUser = (input: InviteUserBody): Promise<{ user: User }> => post('/users', input);

/** Changes name, roles or the disabled flag of a user (admin). */
export const updateUser = (id: number, input: UpdateUserBody): Promise<{ user: User }> => patch(`/users/${id}`, input);
