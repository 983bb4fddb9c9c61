import { data } from "react-router";
import type { Route } from "./+types/mail";
import { listCaughtMail } from "~/mail/caught-mail.server";
import { requireUser } from "~/auth/permissions.server";

export const meta: Route.MetaFunction = () => [{ title: "Caught e-mail · Visitwort" }];

/**
 * What the local SMTP catcher received, for developers. It exists only while mail goes to the
 * catcher: with a real SMTP server configured (SMTP_URL) the page is not there, since the
 * messages hold sign-in links. Coordinators only, for the same reason.
 */
export async function loader({ request, context }: Route.LoaderArgs) {
  requireUser(request, context, { roles: ["coordinator"] });
  if (process.env.SMTP_URL) throw data("There is nothing at this address.", { status: 404 });
  return { messages: await listCaughtMail(50) };
}

export default function CaughtMail({ loaderData }: Route.ComponentProps) {
  return (
    <div className="space-y-4">
      <h1 className="text-3xl">Caught e-mail</h1>
      <p className="text-ink-soft">
        Local development only: messages the app sent to the SMTP catcher started by <code>npm start</code>, newest first.
      </p>
      {loaderData.messages.length === 0 && <p>Nothing yet.</p>}
      <ul className="space-y-3">
        {loaderData.messages.map((m) => (
          <li key={m.id} className="rounded-lg border border-ink/10 bg-white/60 p-3">
            <p className="text-sm text-ink-soft">
              {m.receivedAt} · to {m.to.join(", ")} · from {m.from}
            </p>
            <p className="font-semibold">{m.subject}</p>
            <pre className="mt-2 whitespace-pre-wrap break-words font-sans text-[0.95rem]">{m.text}</pre>
          </li>
        ))}
      </ul>
    </div>
  );
}
