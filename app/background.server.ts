import { getOrm } from "./db/orm.server.ts";
import { startOutboxWorker } from "./mail/outbox.server.ts";

/**
 * Work the server does beside answering requests, started once per process by the server
 * entry: the e-mail outbox worker.
 */
const state = globalThis as typeof globalThis & { __visitwortBackground?: boolean };

export function startBackgroundWork() {
  if (state.__visitwortBackground) return;
  state.__visitwortBackground = true;
  startOutboxWorker(async () => (await getOrm()).em.fork());
}
