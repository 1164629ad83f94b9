/** The client's view of permissions: the same `can()` the server's guards use (shared/permissions.ts). */
import { can, type Action, type Resource } from "@shared/permissions";
import { ApiError } from "./api-client";
import type { Me } from "./auth";

export function canInActiveWorkshop<R extends Resource>(me: Me | null | undefined, resource: R, action: Action<R>): boolean {
  return can(me?.activeWorkshop?.role, resource, action);
}

/** For loaders: a page the role may not use answers 403 like the API would, and the error element says so. */
export function assertCan<R extends Resource>(me: Me | null | undefined, resource: R, action: Action<R>, what: string): void {
  if (!canInActiveWorkshop(me, resource, action)) {
    throw new ApiError(403, "forbidden", `Your role in this workshop does not allow ${what}. Ask the workshop owner if you need it.`);
  }
}
