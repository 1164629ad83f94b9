/**
 * Every route path of the client, in one place, so a renamed page changes one line. Components link with `getHref`,
 * the router matches `path`. Nothing else in src/ spells a URL of a page.
 */
export const paths = {
  home: { path: "/", getHref: () => "/" },

  auth: {
    signIn: {
      path: "/sign-in",
      getHref: (redirectTo?: string | null) =>
        `/sign-in${redirectTo ? `?redirectTo=${encodeURIComponent(redirectTo)}` : ""}`,
    },
    signUp: {
      path: "/sign-up",
      getHref: (redirectTo?: string | null) =>
        `/sign-up${redirectTo ? `?redirectTo=${encodeURIComponent(redirectTo)}` : ""}`,
    },
    createWorkshop: { path: "/create-workshop", getHref: () => "/create-workshop" },
    /** After sign-up: the confirmation link is on its way. `next` is where the link leads afterwards. */
    checkMail: {
      path: "/check-your-mail",
      getHref: (email: string, next?: string | null) => `/check-your-mail?${new URLSearchParams({ email, ...(next ? { next } : {}) })}`,
    },
    /** Where the confirmation link lands (signed in by then); it goes on to `next`, or shows what went wrong. */
    emailConfirmed: {
      path: "/email-confirmed",
      getHref: (next?: string | null) => `/email-confirmed${next ? `?next=${encodeURIComponent(next)}` : ""}`,
    },
    forgotPassword: { path: "/forgot-password", getHref: () => "/forgot-password" },
    /** The reset link lands here with `?token=` (or `?error=INVALID_TOKEN`). */
    resetPassword: { path: "/reset-password", getHref: () => "/reset-password" },
  },

  /** Pages anyone may open without signing in: the invitation landing and certificate verification. */
  public: {
    invitation: { path: "/invite/:id", getHref: (id: string) => `/invite/${encodeURIComponent(id)}` },
    verify: { path: "/verify/:code", getHref: (code: string) => `/verify/${encodeURIComponent(code)}` },
  },

  /**
   * A strike's analysis page, inside the signed-in shell. Callable (`paths.strike(id)`) and in the
   * same `{ path, getHref }` shape as the others.
   */
  strike: Object.assign((id: string) => `/strikes/${encodeURIComponent(id)}`, {
    path: "/strikes/:strikeId",
    getHref: (id: string) => `/strikes/${encodeURIComponent(id)}`,
  }),

  app: {
    root: { path: "/app", getHref: () => "/app" },
    dashboard: { path: "", getHref: () => "/app" },
    batches: { path: "batches", getHref: () => "/app/batches" },
    newBatch: { path: "batches/new", getHref: () => "/app/batches/new" },
    batch: { path: "batches/:batchId", getHref: (id: string) => `/app/batches/${encodeURIComponent(id)}` },
    unit: { path: "units/:unitId", getHref: (id: string) => `/app/units/${encodeURIComponent(id)}` },
    specifications: { path: "specifications", getHref: () => "/app/specifications" },
    newSpecification: { path: "specifications/new", getHref: (family?: string) => `/app/specifications/new${family ? `?family=${encodeURIComponent(family)}` : ""}` },
    specification: { path: "specifications/:specId", getHref: (id: string) => `/app/specifications/${encodeURIComponent(id)}` },
    specificationModes: { path: "specifications/:specId/modes", getHref: (id: string, search = "") => `/app/specifications/${encodeURIComponent(id)}/modes${search}` },
    editSpecification: { path: "specifications/:specId/edit", getHref: (id: string) => `/app/specifications/${encodeURIComponent(id)}/edit` },
    settings: { path: "settings", getHref: () => "/app/settings" },
    instruments: { path: "instruments", getHref: () => "/app/instruments" },
    instrument: { path: "instruments/:instrumentId", getHref: (id: string) => `/app/instruments/${encodeURIComponent(id)}` },
    members: { path: "members", getHref: () => "/app/members" },
    outbox: { path: "outbox", getHref: () => "/app/outbox" },
    outboxMessage: { path: "outbox/:id", getHref: (id: string) => `/app/outbox/${encodeURIComponent(id)}` },
  },
} as const;

/** Only same-site, in-app paths are honoured as a place to return to after signing in. */
export function safeRedirect(target: string | null | undefined, fallback: string = paths.app.root.getHref()): string {
  if (!target || !target.startsWith("/") || target.startsWith("//") || target.startsWith("/api/")) return fallback;
  return target;
}
