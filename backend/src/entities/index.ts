// Every entity, listed explicitly (no globs: tsx, tsc and vitest must all see the same set).
import { Club } from './club.entity';
import { Invitation } from './invitation.entity';
import { Membership } from './membership.entity';
import { User } from './user.entity';

export { Club, Invitation, Membership, User };
export { clubRoles, type ClubRole } from './membership.entity';
export { unitSystems, type UnitSystem } from './user.entity';

export const entities = [User, Club, Membership, Invitation];
