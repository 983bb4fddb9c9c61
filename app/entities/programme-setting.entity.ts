import { defineEntity, p, type InferEntity } from "@mikro-orm/core";

/** A setting of the programme that a coordinator changes in the app, by name. */
export const ProgrammeSetting = defineEntity({
  name: "ProgrammeSetting",
  tableName: "programme_setting",
  properties: {
    key: p.string().length(100).primary(),
    value: p.json<unknown>(),
    updatedAt: p.datetime().onCreate(() => new Date()).onUpdate(() => new Date()),
  },
});

export type ProgrammeSetting = InferEntity<typeof ProgrammeSetting>;
