// Sign-in, sign-out, the session probe and password change. The CSRF token is bound to the session, so
// every call that swaps the session drops the cached token.
import { ApiError } from './errors';
import { http } from './http';
import type { SessionPayload } from './types';

export async function signIn(email: string, password: string): Promise<SessionPayload> {
  const session = await http.post<SessionPayload>(
    '/auth/login',
    { email, password },
    { allowUnauthenticated: true },
  );
  http.resetCsrfToken();
  return session;
}

export async function signOut(): Promise<void> {
  try {
    await http.post<void>('/auth/logout', undefined, { allowUnauthenticated: true });
  } finally {
    http.resetCsrfToken();
  }
}

/** The current session, or null when nobody is signed in. */
export async function fetchSession(): Promise<SessionPayload | null> {
  try {
    return await http.get<SessionPayload>('/auth/me', { allowUnauthenticated: true });
  } catch (error) {
    if (error instanceof ApiError && error.status === 401) return null;
    throw error;
  }
}

export function changePassword(currentPassword: string, newPassword: string): Promise<void> {
  return http.post<void>('/auth/password', { currentPassword, newPassword });
}
