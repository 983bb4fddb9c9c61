import { MikroORM, type EntityManager } from "@mikro-orm/postgresql";
import { createContext, type MiddlewareFunction } from "react-router";
import config from "../../mikro-orm.config.ts";

// Kept on globalThis so that the dev server's module reloads reuse one pool.
const cache = globalThis as typeof globalThis & { __visitwortOrm?: Promise<MikroORM> };

/** The one ORM of this process: initialised on first use, closed when the process is told to stop. */
export function getOrm(): Promise<MikroORM> {
  if (!cache.__visitwortOrm) {
    cache.__visitwortOrm = MikroORM.init(config);
    // An open pool keeps react-router-serve alive after SIGTERM; close it so the server exits.
    process.once("SIGTERM", () => void closeOrm().finally(() => process.exit(0)));
    process.once("SIGINT", () => void closeOrm().finally(() => process.exit(0)));
  }
  return cache.__visitwortOrm;
}

export async function closeOrm() {
  const pending = cache.__visitwortOrm;
  cache.__visitwortOrm = undefined;
  if (pending) await (await pending).close(true);
}

/** The request's own EntityManager, forked from the global one by `databaseMiddleware`. */
export const entityManagerContext = createContext<EntityManager>();

export const databaseMiddleware: MiddlewareFunction<Response> = async ({ context }, next) => {
  const orm = await getOrm();
  context.set(entityManagerContext, orm.em.fork());
  return next();
};
