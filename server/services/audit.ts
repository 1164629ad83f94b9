/** The append-only audit trail: who did what to which record, with before and after. */
import type { Db } from "../db/client.ts";
import { auditEvent } from "../db/schema.ts";

export type Actor = { workshopId: string; userId: string | null };

export function audit(
  db: Pick<Db, "insert">,
  actor: Actor,
  action: string,
  entity: string,
  entityId: string,
  change: { before?: unknown; after?: unknown } = {},
): void {
  db.insert(auditEvent)
    .values({ workshopId: actor.workshopId, actorId: actor.userId, action, entity, entityId, before: change.before ?? null, after: change.after ?? null })
    .run();
}
