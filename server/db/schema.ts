/** The whole schema, for drizzle-kit and for `drizzle(sqlite, { schema })`. */
export * from "./auth-schema.ts";
export * from "./app-schema.ts";
