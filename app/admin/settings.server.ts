import type { EntityManager } from "@mikro-orm/postgresql";
import { z } from "zod";
import { ProgrammeSetting } from "../entities/index.ts";

/** The programme's settings, each with its type and default. */
const SETTINGS = {
  // Off by default: most programmes vet volunteers and invite them.
  openSignUp: { schema: z.boolean(), default: false },
} as const;

export type SettingName = keyof typeof SETTINGS;
type SettingValue<K extends SettingName> = z.output<(typeof SETTINGS)[K]["schema"]>;

export async function readSetting<K extends SettingName>(em: EntityManager, key: K): Promise<SettingValue<K>> {
  const row = await em.findOne(ProgrammeSetting, { key });
  const parsed = SETTINGS[key].schema.safeParse(row?.value);
  return (parsed.success ? parsed.data : SETTINGS[key].default) as SettingValue<K>;
}

export async function writeSetting<K extends SettingName>(em: EntityManager, key: K, value: SettingValue<K>) {
  const valid = SETTINGS[key].schema.parse(value);
  await em.upsert(ProgrammeSetting, { key, value: valid, updatedAt: new Date() });
}
