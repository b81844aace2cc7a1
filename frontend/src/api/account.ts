// The signed-in user's own profile.
import { http } from './http';
import type { PreferredUnits, User } from './types';

export interface AccountChanges {
  displayName?: string;
  preferredUnits?: PreferredUnits;
}

export async function updateAccount(changes: AccountChanges): Promise<User> {
  const { user } = await http.patch<{ user: User }>('/account', changes);
  return user;
}
