import { del, get, post } from './http';
import type { Page, SessionInfo, User } from './types';

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

/** The signed-in user's open sessions (this browser's is marked `isCurrent`). */
export const listSessions = (): Promise<Page<SessionInfo>> => get('/auth/sessions');

/** Ends one of the signed-in user's sessions (another device, or this one). */
export const endSession = (id: number): Promise<void> => del(`/auth/sessions/${id}`);

/** Ends every session of the signed-in user, this one too ("sign out everywhere"). */
export const signOutEverywhere = (): Promise<void> => del('/auth/sessions');
