// Builds every service from the DataSource and configuration. Services never see req/res.
import type { DataSource } from 'typeorm';
import { createAccountService, type AccountService } from './accounts.service';
import { createMemberService, type MemberService } from './members.service';
import { createCheckService, type CheckService } from './checks.service';
import { createRulesetService, type RulesetService } from './rulesets.service';
import { createAuditService, type AuditService } from './audit.service';
import { createMailboxService, createMailService, type MailboxService, type MailService } from './mail';
import { createJobProgressReader, createJobProgressStore, type JobProgressReader } from './jobs';

export interface Services {
  accounts: AccountService;
  members: MemberService;
  rulesets: RulesetService;
  checks: CheckService;
  audit: AuditService;
  mail: MailService;
  mailbox: MailboxService;
  jobProgress: JobProgressReader;
}

export function createServices(ds: DataSource, options: { publicUrl: string }): Services {
  const rulesets = createRulesetService(ds);
  const audit = createAuditService(ds);
  const members = createMemberService(ds, { publicUrl: options.publicUrl, audit });
  return {
    accounts: createAccountService(ds),
    members,
    rulesets,
    checks: createCheckService(ds, rulesets),
    audit,
    mail: createMailService(ds),
    mailbox: createMailboxService(ds),
    jobProgress: createJobProgressReader(createJobProgressStore((text, values) => ds.query(text, values)), members),
  };
}
