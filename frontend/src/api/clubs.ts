// Club membership administration (club admins), the club's settings (its time zone) and invitations
// (the invited person, signed out).
import { http } from './http';
import type { AddMemberResult, ClubMember, InvitationSummary, Role, SessionPayload } from './types';
import type { ClubSettingsWire } from '@contracts/clubs';

const membersPath = (clubId: string) => `/clubs/${encodeURIComponent(clubId)}/members`;

export async function listMembers(clubId: string): Promise<ClubMember[]> {
  const { members } = await http.get<{ members: ClubMember[] }>(membersPath(clubId));
  return members;
}

export function addMember(clubId: string, email: string, roles: Role[]): Promise<AddMemberResult> {
  return http.post<AddMemberResult>(membersPath(clubId), { email, roles });
}

export async function updateMemberRoles(clubId: string, userId: string, roles: Role[]): Promise<ClubMember> {
  const { member } = await http.patch<{ member: ClubMember }>(
    `${membersPath(clubId)}/${encodeURIComponent(userId)}`,
    { roles },
  );
  return member;
}

export function removeMember(clubId: string, userId: string): Promise<void> {
  return http.delete(`${membersPath(clubId)}/${encodeURIComponent(userId)}`);
}

const invitationPath = (token: string) => `/invitations/${encodeURIComponent(token)}`;

export function fetchInvitation(token: string): Promise<InvitationSummary> {
  return http.get<InvitationSummary>(invitationPath(token), { allowUnauthenticated: true });
}

export async function acceptInvitation(
  token: string,
  password: string,
  displayName?: string,
): Promise<SessionPayload> {
  const body = displayName ? { password, displayName } : { password };
  const session = await http.post<SessionPayload>(`${invitationPath(token)}/accept`, body, {
    allowUnauthenticated: true,
  });
  http.resetCsrfToken();
  return session;
}

export type { ClubSettingsWire as ClubSettings } from '@contracts/clubs';

const settingsPath = (clubId: string) => `/clubs/${encodeURIComponent(clubId)}/settings`;

/** The club's time zone and its calendar date today (every member may read them). */
export async function getClubSettings(clubId: string): Promise<ClubSettingsWire> {
  return (await http.get<{ settings: ClubSettingsWire }>(settingsPath(clubId))).settings;
}

export async function updateClubSettings(clubId: string, timeZone: string): Promise<ClubSettingsWire> {
  return (await http.patch<{ settings: ClubSettingsWire }>(settingsPath(clubId), { timeZone })).settings;
}
