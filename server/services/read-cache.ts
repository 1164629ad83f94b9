/**
 * A read cache for the ledger views that every bench tablet polls. An entry is valid while the
 * database is unchanged: `total_changes()` counts this connection's writes and `PRAGMA data_version`
 * moves when another connection (a worker process) commits, so any write anywhere invalidates it.
 * No invalidation calls to forget; the price is two tiny queries per read.
 */
import type { Sqlite } from "../db/client.ts";

export function createReadCache(sqlite: Sqlite, maxEntries = 500) {
  const changes = sqlite.prepare("SELECT total_changes() AS n");
  const entries = new Map<string, { version: string; value: unknown }>();
  const version = () => `${(changes.get() as { n: number }).n}:${sqlite.pragma("data_version", { simple: true })}`;
  return {
    get<T>(key: string, compute: () => T): T {
      const v = version();
      const hit = entries.get(key);
      if (hit && hit.version === v) {
        entries.delete(key);
        entries.set(key, hit); // most recently used last
        return hit.value as T;
      }
      const value = compute();
      entries.set(key, { version: v, value });
      if (entries.size > maxEntries) entries.delete(entries.keys().next().value!);
      return value;
    },
  };
}

export type ReadCache = ReturnType<typeof createReadCache>;
