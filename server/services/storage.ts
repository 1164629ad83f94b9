/**
 * Stored recordings: under DATA_DIR/strikes/<workshop>/<generated>.wav, never in a served folder and
 * never under the uploaded name. Uploads stream into DATA_DIR/incoming first and are moved into place
 * only once accepted, so a refused or interrupted upload leaves nothing behind.
 */
import { createHash, randomUUID } from "node:crypto";
import { createReadStream, mkdirSync, readdirSync, renameSync, rmSync, statfsSync, statSync } from "node:fs";
import path from "node:path";
import { eq, sum } from "drizzle-orm";
import type { Db } from "../db/client.ts";
import { strike } from "../db/schema.ts";
import { HttpError } from "../http-error.ts";

export type Storage = ReturnType<typeof createStorage>;

export function createStorage(dataDir: string, limits: { quotaBytes: number; minFreeBytes: number }) {
  const root = path.join(dataDir, "strikes");
  const incoming = path.join(dataDir, "incoming");
  mkdirSync(root, { recursive: true });
  mkdirSync(incoming, { recursive: true });

  return {
    root,
    incoming,
    /** Absolute path of a stored file key (keys are relative: `<workshop>/<uuid>.wav`). */
    pathOf(fileKey: string) {
      const p = path.resolve(root, fileKey);
      if (!p.startsWith(root + path.sep)) throw new Error(`file key escapes the store: ${fileKey}`);
      return p;
    },
    /** Refuses early when the disk is nearly full or the workshop's quota would be exceeded. */
    checkRoom(db: Db, workshopId: string, incomingBytes: number) {
      const fs = statfsSync(dataDir);
      const free = fs.bavail * fs.bsize;
      if (free - incomingBytes < limits.minFreeBytes) {
        throw new HttpError(507, "insufficient_storage", "The server's disk is nearly full, so the recording was not stored. Ask the workshop owner to free space, then upload again.");
      }
      const [{ used }] = db.select({ used: sum(strike.sizeBytes) }).from(strike).where(eq(strike.workshopId, workshopId)).all();
      if (Number(used ?? 0) + incomingBytes > limits.quotaBytes) {
        const mb = (n: number) => `${Math.round(n / 1e6)} MB`;
        throw new HttpError(413, "payload_too_large", `This workshop's storage quota (${mb(limits.quotaBytes)}) would be exceeded: ${mb(Number(used ?? 0))} used. Ask the owner to raise WORKSHOP_QUOTA_MB.`);
      }
    },
    async sha256Of(file: string): Promise<string> {
      const hash = createHash("sha256");
      for await (const chunk of createReadStream(file)) hash.update(chunk as Buffer);
      return hash.digest("hex");
    },
    /** Moves an accepted upload into the store; returns its key. */
    keep(tempPath: string, workshopId: string): string {
      const dir = path.join(root, workshopId);
      mkdirSync(dir, { recursive: true });
      const key = `${workshopId}/${randomUUID()}.wav`;
      renameSync(tempPath, path.join(root, key));
      return key;
    },
    discard(file: string) {
      rmSync(file, { force: true });
    },
    /** Every stored key (for the consistency check of files against rows). */
    listKeys(): string[] {
      const keys: string[] = [];
      for (const w of readdirSync(root)) {
        if (!statSync(path.join(root, w)).isDirectory()) continue;
        for (const f of readdirSync(path.join(root, w))) keys.push(`${w}/${f}`);
      }
      return keys;
    },
    /**
     * After a crash: a file moved into the store whose row never committed is removed, and a row
     * whose file is gone is failed with a reason, so files and rows always match one to one.
     */
    reconcile(db: Db): { orphanFiles: number; missingFiles: number } {
      const rows = db.select({ id: strike.id, fileKey: strike.fileKey, state: strike.state }).from(strike).all();
      const known = new Set(rows.map((r) => r.fileKey));
      const keys = this.listKeys();
      const onDisk = new Set(keys);
      let orphanFiles = 0;
      for (const key of keys) {
        if (!known.has(key)) {
          rmSync(path.join(root, key), { force: true });
          orphanFiles++;
        }
      }
      let missingFiles = 0;
      for (const r of rows) {
        if (!onDisk.has(r.fileKey) && (r.state === "queued" || r.state === "analysing")) {
          db.update(strike).set({ state: "failed", failureCode: "missing_file", failureReason: "The stored recording is missing from the server's disk, so it could not be analysed. Upload the strike again." }).where(eq(strike.id, r.id)).run();
          missingFiles++;
        }
      }
      return { orphanFiles, missingFiles };
    },
    /** Removes half-received uploads left by a crash. */
    sweepIncoming() {
      for (const f of readdirSync(incoming)) rmSync(path.join(incoming, f), { force: true });
    },
  };
}
