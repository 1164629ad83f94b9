/** The audit trail and a unit's history, read a page at a time (newest first). */
import { z } from "zod";

export const AUDIT_PAGE_MAX = 100;

export const auditQuerySchema = z.object({
  unitId: z.string().max(100).optional(),
  entityId: z.string().max(100).optional(),
  /** The `nextCursor` of the previous page: events older than it. */
  cursor: z
    .string()
    .regex(/^\d{1,15}$/, "Use the nextCursor of the previous page.")
    .optional(),
  limit: z.coerce
    .number({ error: "The page size must be a number." })
    .int("The page size must be a whole number.")
    .min(1, "The page size is at least 1.")
    .max(AUDIT_PAGE_MAX, `The page size is at most ${AUDIT_PAGE_MAX}.`)
    .default(50),
});
export type AuditQuery = z.infer<typeof auditQuerySchema>;

export type AuditEvent = { id: number; action: string; entity: string; entityId: string; before: unknown; after: unknown; at: string; actor: string };
/** `nextCursor` is null on the last page. */
export type AuditPage = { events: AuditEvent[]; nextCursor: string | null };
