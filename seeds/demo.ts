/**
 * The invented demo workshop (DESIGN.md §9): seeded on an empty database unless SEED_DEMO=0.
 * Everything here is made up: the workshops, the people and their addresses.
 */
import { randomUUID } from "node:crypto";
import { count } from "drizzle-orm";
import type { AppDeps } from "../server/app.ts";
import { member, organization, user } from "../server/db/schema.ts";
import type { RoleName } from "../shared/permissions.ts";

export const DEMO_PASSWORD = "tinelog-demo";

export const DEMO_WORKSHOP = { name: "Brightwater Tuning Works", slug: "brightwater" };
export const OTHER_WORKSHOP = { name: "Fernhollow Chime Co.", slug: "fernhollow" };

export const DEMO_USERS = [
  { email: "owner@example.com", name: "Mara Ellison", role: "owner", workshop: "demo", label: "owner of Brightwater Tuning Works" },
  { email: "qa@example.com", name: "Tobias Renn", role: "qa", workshop: "demo", label: "quality (qa), Brightwater" },
  { email: "maker@example.com", name: "Ilse Varga", role: "maker", workshop: "demo", label: "maker, Brightwater" },
  { email: "other@example.com", name: "Owen Pike", role: "owner", workshop: "other", label: "owner of Fernhollow Chime Co. (another workshop)" },
] as const satisfies readonly { email: string; name: string; role: RoleName; workshop: "demo" | "other"; label: string }[];

export type DemoIds = { workshopId: string; otherWorkshopId: string; users: Record<string, string> };

/** Seeds the demo on an empty database; returns null when there were users already. */
export async function seedDemo(deps: AppDeps): Promise<DemoIds | null> {
  const { db, auth } = deps;
  const [{ n }] = db.select({ n: count() }).from(user).all();
  if (n > 0) return null;

  const users: Record<string, string> = {};
  for (const u of DEMO_USERS) {
    const res = await auth.api.signUpEmail({ body: { email: u.email, password: DEMO_PASSWORD, name: u.name } });
    users[u.email] = res.user.id;
  }
  const workshopId = randomUUID();
  const otherWorkshopId = randomUUID();
  db.transaction((tx) => {
    const created = new Date();
    tx.insert(organization).values([
      { id: workshopId, name: DEMO_WORKSHOP.name, slug: DEMO_WORKSHOP.slug, createdAt: created },
      { id: otherWorkshopId, name: OTHER_WORKSHOP.name, slug: OTHER_WORKSHOP.slug, createdAt: created },
    ]).run();
    tx.insert(member)
      .values(
        DEMO_USERS.map((u) => ({
          id: randomUUID(),
          organizationId: u.workshop === "demo" ? workshopId : otherWorkshopId,
          userId: users[u.email],
          role: u.role,
          createdAt: created,
        })),
      )
      .run();
  });
  return { workshopId, otherWorkshopId, users };
}
