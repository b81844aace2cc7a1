// How each club role is named on screen and what it lets a person do in Cagewright.
import { ROLE_WORDS } from '@contracts/roles';
import { ROLES, type Role } from '@/api/types';

/** The labels are the server's (contracts/roles.ts), so the invitation mail and the screens agree. */
export const roleLabels: Record<Role, string> = Object.fromEntries(ROLES.map((r) => [r, ROLE_WORDS[r].label])) as Record<Role, string>;

export const roleDuties: Record<Role, string> = {
  builder:
    "Keeps build sheets for their cars and pre-checks a cage against the club's rules before tech inspection.",
  steward: 'Reviews the pre-check reports builders send in and issues cage records for the club.',
  admin: "Decides who belongs to the club and with which roles, and keeps the club's cage rulebooks.",
};

export const roleOptions = ROLES.map((role) => ({ label: roleLabels[role], value: role }));
