import { getOrm } from "./db/orm.server.ts";
import { startOutboxWorker } from "./mail/outbox.server.ts";
import { sendDailyDigests } from "./determinations/determinations.server.ts";

/**
 * Work the server does beside answering requests, started once per process by the server
 * entry: the e-mail outbox worker and the daily digests of determinations.
 */
const state = globalThis as typeof globalThis & { __visitwortBackground?: boolean };

export function startBackgroundWork() {
  if (state.__visitwortBackground) return;
  state.__visitwortBackground = true;
  startOutboxWorker(async () => (await getOrm()).em.fork());
  // Daily digests: each recorder who chose one gets it at most once a day; checking every ten
  // minutes keeps the time of day steady without a scheduler.
  if (process.env.VISITWORT_MAIL_WORKER !== "off") {
    const origin = process.env.PUBLIC_URL ?? `http://127.0.0.1:${process.env.PORT ?? 3000}`;
    setInterval(() => {
      getOrm()
        .then((orm) => sendDailyDigests(orm.em.fork(), origin))
        .catch((error) => console.error(`· daily digests: ${(error as Error).message}`));
    }, 10 * 60 * 1000).unref();
  }
}
