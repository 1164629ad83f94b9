/**
 * Route guards: each route states the permission it needs (shared/permissions.ts); handlers never
 * compare role names. 401 without a session, 403 when the role lacks the permission.
 */
import type { NextFunction, Request, RequestHandler, Response } from "express";
import { can, type Action, type Resource } from "../../shared/permissions.ts";
import { forbidden, HttpError, unauthenticated } from "../http-error.ts";
import type { Workshop } from "./context.ts";

export const requireUser: RequestHandler = Object.assign(
  (req: Request, _res: Response, next: NextFunction) => next(req.ctx.user ? undefined : unauthenticated()),
  { permission: "signed-in" },
);

export function requirePermission<R extends Resource>(resource: R, action: Action<R>): RequestHandler {
  const guard = (req: Request, _res: Response, next: NextFunction) => {
    if (!req.ctx.user) return next(unauthenticated());
    if (!req.ctx.workshop) return next(new HttpError(403, "forbidden", "Join or create a workshop first."));
    if (!can(req.ctx.workshop.role, resource, action)) return next(forbidden());
    next();
  };
  return Object.assign(guard, { permission: `${resource}:${action}` });
}

/** Marks a route as deliberately open to anyone (the authorization matrix checks the mark). */
export const publicRoute: RequestHandler = Object.assign(
  (_req: Request, _res: Response, next: NextFunction) => next(),
  { permission: "public" },
);

/** The signed-in user's active workshop; only call after a guard. */
export function workshopOf(req: Request): Workshop {
  if (!req.ctx.workshop) throw new HttpError(403, "forbidden", "Join or create a workshop first.");
  return req.ctx.workshop;
}

export function userOf(req: Request) {
  if (!req.ctx.user) throw unauthenticated();
  return req.ctx.user;
}
