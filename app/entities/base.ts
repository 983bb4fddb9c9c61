import { p } from "@mikro-orm/core";

/** id, createdAt and updatedAt, spread into every entity's properties. */
export const baseProperties = {
  id: p.integer().primary().autoincrement(),
  createdAt: p.datetime().onCreate(() => new Date()),
  updatedAt: p.datetime().onCreate(() => new Date()).onUpdate(() => new Date()),
};
