/**
 * `npm run verify-ledger`: walks the hash chain of every workshop and names the first entry that
 * does not match. Exit 0 when intact, 1 when a problem is found, 2 when the database cannot be read.
 */
import Database from "better-sqlite3";
import { existsSync } from "node:fs";
import { loadEnv } from "../env.ts";
import { verifyChain } from "../services/ledger-chain.ts";

const file = process.argv[2] ?? loadEnv().databaseFile;
if (!existsSync(file)) {
  console.error(`verify-ledger: no database at ${file}`);
  process.exit(2);
}
const sqlite = new Database(file, { readonly: true, fileMustExist: true });
const { entries, problems } = verifyChain(sqlite);
if (!problems.length) {
  console.log(`Ledger intact: ${entries} entries verified in ${file}`);
  process.exit(0);
}
for (const p of problems) {
  console.log(`Ledger broken in workshop ${p.workshopId}: entry ${p.seq} (${p.kind} ${p.entityId}) — ${p.problem}`);
}
process.exit(1);
