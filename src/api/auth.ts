import { get, post } from './http';
import type { User } from './types';

/** Signs in with e-mail and password; the server sets the session cookie. */
export const login = (email: string, password: string): Promise<{ user: User }> => post('/auth/login', { email, password });

/** Ends the session (clears the cookie). */
export const logout = (): Promise<void> => post('/auth/logout');

/** The signed-in user; rejects with a 401 ApiError when there is no valid session. */
export const fetchCurrentUser = (): Promise<{ user: User }> => get('/auth/me');

/** Asks for a password-reset e-mail. Always accepted, whether or not the address has an account. */
export const requestPasswordReset = (email: string): Promise<void> => post('/auth/forgot', { email });

/** Sets a new password with a reset or invitation token; signs the user in. */
export const resetPassword = (token: string, password: string): Promise<{ user: User }> => post('/auth/reset', { token, password });
