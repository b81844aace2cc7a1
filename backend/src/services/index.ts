// Builds every service from the DataSource and configuration. Services never see req/res.
import type { DataSource } from 'typeorm';
import { createAccountService, type AccountService } from './accounts.service';
import { createMemberService, type MemberService } from './members.service';

export interface Services {
  accounts: AccountService;
  members: MemberService;
}

export function createServices(ds: DataSource, options: { publicUrl: string }): Services {
  return { accounts: createAccountService(ds), members: createMemberService(ds, { publicUrl: options.publicUrl }) };
}
