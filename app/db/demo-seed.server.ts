import type { EntityManager } from "@mikro-orm/postgresql";
import { User } from "../entities/index.ts";
import { createUser } from "../auth/accounts.server.ts";
import type { Role } from "../auth/roles.ts";

/**
 * The invented demo programme: one account per role, for trying Visitwort locally. Created by
 * the demo seed only (npm start, the browser tests), never by a migration; the README lists them.
 */
export const DEMO_PASSWORD = "meadow-demo-2026";

export const DEMO_ACCOUNTS: { email: string; name: string; roles: Role[] }[] = [
  { email: "recorder@demo.visitwort.test", name: "Wren Halloway", roles: ["recorder"] },
  { email: "botanist@demo.visitwort.test", name: "Sorrel Pike", roles: ["botanist"] },
  { email: "beeverifier@demo.visitwort.test", name: "Tamsin Bracken", roles: ["bee_verifier"] },
  { email: "planner@demo.visitwort.test", name: "Ivo Marchetti", roles: ["planner"] },
  { email: "nursery@demo.visitwort.test", name: "Rowan Ashby", roles: ["nursery"] },
  { email: "coordinator@demo.visitwort.test", name: "Juniper Vale", roles: ["coordinator"] },
];

/** Creates the demo accounts that are missing; an existing account is left as it is. */
export async function seedDemoAccounts(em: EntityManager): Promise<number> {
  let created = 0;
  for (const account of DEMO_ACCOUNTS) {
    if (await em.count(User, { email: account.email })) continue;
    await createUser(em, { ...account, password: DEMO_PASSWORD });
    created++;
  }
  return created;
}
