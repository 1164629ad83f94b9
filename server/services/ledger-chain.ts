/**
 * The hash chain over the quality record (measurement, evaluation, disposition, release, calibration, and
 * the corrections: strike voids and certificate withdrawals). Each entry
 * holds sha256(canonical row) and the previous entry's hash within the workshop, so changing any
 * byte of a chained row, or removing an entry, breaks every hash after it.
 */
import { createHash } from "node:crypto";
import type { Sqlite } from "../db/client.ts";

export type ChainKind = "measurement" | "evaluation" | "disposition" | "release" | "strike_void" | "certificate_withdrawal" | "calibration";

const tableOf: Record<ChainKind, string> = {
  measurement: "measurement",
  evaluation: "evaluation",
  disposition: "disposition",
  release: "batch",
  strike_void: "strike_void",
  certificate_withdrawal: "certificate_withdrawal",
  calibration: "instrument_calibration",
};

/**
 * Columns added to a chained table after rows were already chained. They are left out of the
 * canonical form while null, so the rows chained before the column existed still hash as they did.
 */
const LATER_COLUMNS: Partial<Record<ChainKind, string[]>> = {
  disposition: ["supersedes_id"],
};

export const GENESIS = "0".repeat(64);

const sha256 = (s: string) => createHash("sha256").update(s).digest("hex");

/** Stable JSON: keys sorted, so the same row always hashes the same. */
function stable(value: unknown): string {
  if (value === null || typeof value !== "object") return JSON.stringify(value);
  if (Array.isArray(value)) return `[${value.map(stable).join(",")}]`;
  const o = value as Record<string, unknown>;
  return `{${Object.keys(o).sort().map((k) => `${JSON.stringify(k)}:${stable(o[k])}`).join(",")}}`;
}

/** The row as stored (raw column values), in canonical form. */
export function canonicalRow(sqlite: Sqlite, kind: ChainKind, entityId: string): string | null {
  const row = sqlite.prepare(`SELECT * FROM ${tableOf[kind]} WHERE id = ?`).get(entityId) as Record<string, unknown> | undefined;
  if (!row) return null;
  if (kind === "release") {
    // A batch row changes before release; what is sealed is the release itself.
    return stable({ id: row.id, workshop_id: row.workshop_id, code: row.code, spec_version_id: row.spec_version_id, state: row.state, released_by: row.released_by, released_at: row.released_at });
  }
  for (const column of LATER_COLUMNS[kind] ?? []) if (row[column] === null) delete row[column];
  return stable(row);
}

export const entryHash = (e: { workshopId: string; seq: number; kind: string; entityId: string; contentHash: string; prevHash: string }) =>
  sha256(stable({ workshopId: e.workshopId, seq: e.seq, kind: e.kind, entityId: e.entityId, contentHash: e.contentHash, prevHash: e.prevHash }));

/** Appends an entry for a row written in the same transaction. */
export function appendToChain(sqlite: Sqlite, workshopId: string, kind: ChainKind, entityId: string): void {
  const content = canonicalRow(sqlite, kind, entityId);
  if (content === null) throw new Error(`cannot chain ${kind} ${entityId}: row not found`);
  const last = sqlite.prepare("SELECT seq, hash FROM ledger_entry WHERE workshop_id = ? ORDER BY seq DESC LIMIT 1").get(workshopId) as
    | { seq: number; hash: string }
    | undefined;
  const entry = { workshopId, seq: (last?.seq ?? 0) + 1, kind, entityId, contentHash: sha256(content), prevHash: last?.hash ?? GENESIS };
  sqlite
    .prepare("INSERT INTO ledger_entry (workshop_id, seq, kind, entity_id, content_hash, prev_hash, hash) VALUES (?, ?, ?, ?, ?, ?, ?)")
    .run(entry.workshopId, entry.seq, entry.kind, entry.entityId, entry.contentHash, entry.prevHash, entryHash(entry));
}

export type ChainProblem = { workshopId: string; seq: number; kind: string; entityId: string; problem: string };

/** Walks every workshop's chain; returns the first problem per workshop (empty when intact). */
export function verifyChain(sqlite: Sqlite): { entries: number; problems: ChainProblem[] } {
  const rows = sqlite
    .prepare("SELECT workshop_id, seq, kind, entity_id, content_hash, prev_hash, hash FROM ledger_entry ORDER BY workshop_id, seq")
    .all() as { workshop_id: string; seq: number; kind: ChainKind; entity_id: string; content_hash: string; prev_hash: string; hash: string }[];
  const problems: ChainProblem[] = [];
  const broken = new Set<string>();
  const prev = new Map<string, { seq: number; hash: string }>();
  for (const r of rows) {
    if (broken.has(r.workshop_id)) continue;
    const before = prev.get(r.workshop_id);
    const fail = (problem: string) => {
      problems.push({ workshopId: r.workshop_id, seq: r.seq, kind: r.kind, entityId: r.entity_id, problem });
      broken.add(r.workshop_id);
    };
    if (r.seq !== (before?.seq ?? 0) + 1) { fail(`entry ${(before?.seq ?? 0) + 1} is missing`); continue; }
    if (r.prev_hash !== (before?.hash ?? GENESIS)) { fail("does not link to the previous entry"); continue; }
    const recomputed = entryHash({ workshopId: r.workshop_id, seq: r.seq, kind: r.kind, entityId: r.entity_id, contentHash: r.content_hash, prevHash: r.prev_hash });
    if (recomputed !== r.hash) { fail("the entry itself was altered"); continue; }
    const content = canonicalRow(sqlite, r.kind, r.entity_id);
    if (content === null) { fail(`the ${r.kind} row is gone`); continue; }
    if (sha256(content) !== r.content_hash) { fail(`the ${r.kind} row was altered after it was recorded`); continue; }
    prev.set(r.workshop_id, { seq: r.seq, hash: r.hash });
  }
  return { entries: rows.length, problems };
}
