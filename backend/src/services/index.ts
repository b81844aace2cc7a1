// Builds every service from the DataSource and configuration. Services never see req/res.
import type { DataSource } from 'typeorm';
import { createAccountService, type AccountService } from './accounts.service';
import { createMemberService, type MemberService } from './members.service';
import { createCheckService, type CheckService } from './checks.service';
import { createRulesetService, type RulesetService } from './rulesets.service';

export interface Services {
  accounts: AccountService;
  members: MemberService;
  rulesets: RulesetService;
  checks: CheckService;
}

export function createServices(ds: DataSource, options: { publicUrl: string }): Services {
  const rulesets = createRulesetService(ds);
  return {
    accounts: createAccountService(ds),
    members: createMemberService(ds, { publicUrl: options.publicUrl }),
    rulesets,
    checks: createCheckService(ds, rulesets),
  };
}
