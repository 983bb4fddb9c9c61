/**
 * The local mail catcher: an SMTP server on 127.0.0.1 that keeps every message as JSON in
 * .data/mail/ instead of delivering it (shown by the dev page /dev/mail). Without SMTP_URL the
 * app sends its mail here.
 *
 *   tsx scripts/mail-catcher.ts                    listens on MAIL_CATCHER_PORT, default 2526
 *   tsx scripts/mail-catcher.ts --exit-with <pid>  and stops when that process has ended
 *
 * When the port is taken (another checkout's catcher), the next free one up to +20 is used and
 * written to .data/mail-catcher.json, where the app reads it. When this checkout's catcher is
 * already running, it says so and leaves it be.
 */
import path from "node:path";
import { startMailCatcher } from "../app/mail/catcher.server.ts";
import { caughtMailFolder } from "../app/mail/caught-mail.server.ts";
import { DEFAULT_MAIL_CATCHER_PORT, mailCatcherStateFile, readMailCatcherState } from "../app/mail/transport.server.ts";
import { projectRoot } from "../app/db/database-url.server.ts";
import { runLocalService } from "./local-service.ts";

await runLocalService({
  label: "mail catcher",
  portVariable: "MAIL_CATCHER_PORT",
  defaultPort: DEFAULT_MAIL_CATCHER_PORT,
  stateFile: mailCatcherStateFile,
  readState: readMailCatcherState,
  start: (port) => startMailCatcher({ port, host: "127.0.0.1", store: caughtMailFolder }),
  describe: (catcher) => `· mail catcher listening on smtp://127.0.0.1:${catcher.port}, keeping messages in ${path.relative(projectRoot, caughtMailFolder)}/`,
});
