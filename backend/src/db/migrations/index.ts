// Every migration in order, listed explicitly (no globs: tsx, tsc and vitest must all see the same set).
import { Accounts1796083200000 } from './1796083200000-accounts';
import { RulesetsAndChecks1796083300000 } from './1796083300000-rulesets-and-checks';
import { Garage1796083400000 } from './1796083400000-garage';

export const migrations = [Accounts1796083200000, RulesetsAndChecks1796083300000, Garage1796083400000];
