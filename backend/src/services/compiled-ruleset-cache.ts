// Compiled rulesets kept in memory, keyed by what makes a compilation valid: a version that left
// the draft state cannot change (a database trigger guarantees it), so its id is enough; a draft
// is keyed by id + lock version, which moves on with every content change. Concurrent first
// requests for the same key share one compilation (the promise is cached, not the result).
// Bounded: least recently used entries go first, so a busy editor's drafts cannot grow it forever.
import type { CompiledRuleset } from '../domain';

export interface CacheKeyParts {
  id: string;
  status: string;
  lockVersion: number;
}

export function compiledCacheKey(v: CacheKeyParts): string {
  return v.status === 'draft' ? `${v.id}@draft:${v.lockVersion}` : v.id;
}

export interface CompiledRulesetCacheStats {
  compiles: number;
  hits: number;
  size: number;
}

export interface CompiledRulesetCache {
  /** The cached compilation for `key`, or the result of `build` (run at most once at a time per key). */
  get(key: string, build: () => Promise<CompiledRuleset>): Promise<CompiledRuleset>;
  stats(): CompiledRulesetCacheStats;
  clear(): void;
}

export function createCompiledRulesetCache(maxEntries = 64): CompiledRulesetCache {
  // A Map iterates in insertion order; re-inserting on a hit makes the first key the least recent.
  const entries = new Map<string, Promise<CompiledRuleset>>();
  let compiles = 0;
  let hits = 0;
  return {
    get(key, build) {
      const cached = entries.get(key);
      if (cached) {
        hits++;
        entries.delete(key);
        entries.set(key, cached);
        return cached;
      }
      compiles++;
      const pending = build();
      entries.set(key, pending);
      // A failed compilation is not remembered: the next request tries again.
      pending.catch(() => {
        if (entries.get(key) === pending) entries.delete(key);
      });
      while (entries.size > maxEntries) entries.delete(entries.keys().next().value as string);
      return pending;
    },
    stats: () => ({ compiles, hits, size: entries.size }),
    clear: () => entries.clear(),
  };
}
