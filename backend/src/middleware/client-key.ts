// The key limits count a caller under: their IP as Express sees it through TRUST_PROXY, with an IPv6
// address taken as its /56 network (one household or host holds a whole block of them) and an
// IPv4-mapped one as plain IPv4. express-rate-limit's helper does exactly that.
import type { Request } from 'express';
import { ipKeyGenerator } from 'express-rate-limit';

export function clientKey(req: Request): string {
  return req.ip ? ipKeyGenerator(req.ip) : 'unknown';
}
