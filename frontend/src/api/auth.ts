// Sign-in, sign-out, the session probe, password change and reset. The CSRF token is bound to the
// session, so every call that swaps the session drops the cached token.
import type { PasswordResetRequestedWire, PasswordResetWire } from '@contracts/auth';
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

/** Asks for a reset link; the answer is the same whether or not the address has an account. */
export async function requestPasswordReset(email: string): Promise<string> {
  const { message } = await http.post<PasswordResetRequestedWire>('/auth/password-reset', { email }, { allowUnauthenticated: true });
  return message;
}

const resetPath = (token: string) => `/auth/password-reset/${encodeURIComponent(token)}`;

/** The address a reset link belongs to; a 404 ApiError when the link cannot be used. */
export function fetchPasswordReset(token: string): Promise<PasswordResetWire> {
  return http.get<PasswordResetWire>(resetPath(token), { allowUnauthenticated: true });
}

export function resetPassword(token: string, password: string): Promise<void> {
  return http.post<void>(resetPath(token), { password }, { allowUnauthenticated: true });
}
