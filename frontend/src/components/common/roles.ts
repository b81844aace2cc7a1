// How each club role is named on screen and what it lets a person do in Cagewright.
import { ROLES, type Role } from '@/api/types';

export const roleLabels: Record<Role, string> = {
  builder: 'Builder',
  steward: 'Steward',
  admin: 'Admin',
};

export const roleDuties: Record<Role, string> = {
  builder:
    "Keeps build sheets for their cars and pre-checks a cage against the club's rules before tech inspection.",
  steward: 'Reviews the pre-check reports builders send in and issues cage records for the club.',
  admin: "Decides who belongs to the club and with which roles, and keeps the club's cage rulebooks.",
};

export const roleOptions = ROLES.map((role) => ({ label: roleLabels[role], value: role }));
