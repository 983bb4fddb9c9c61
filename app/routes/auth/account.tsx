import { data, Form, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/account";
import { entityManagerContext } from "~/db/orm.server";
import { requireUser } from "~/auth/permissions.server";
import { AccountError, changePassword, createApiToken, listApiTokens, revokeApiToken, updateProfile } from "~/auth/accounts.server";
import { apiTokenForm, changePasswordForm, fieldErrors, formToObject, profileForm, type FieldErrors } from "~/auth/account-schemas";
import { endAllSessions, endSession } from "~/auth/session.server";
import { ROLE_DUTIES, ROLE_LABELS } from "~/auth/roles";
import { noticePreferenceOf, setNoticePreference } from "~/auth/accounts.server";
import { Field, FormMessage, PrimaryButton, SecondaryButton } from "~/components/forms";

export const meta: Route.MetaFunction = () => [{ title: "Your account · Visitwort" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  const user = requireUser(request, context);
  const em = context.get(entityManagerContext);
  const tokens = await listApiTokens(em, user.id);
  const noticePreference = await noticePreferenceOf(em, user.id);
  return { user: { name: user.name, email: user.email, roles: user.roles, noticePreference }, tokens };
}

type ActionResult = { intent: string; message?: string; error?: string; fields?: FieldErrors; newToken?: string };

export async function action({ request, context }: Route.ActionArgs) {
  const user = requireUser(request, context);
  const em = context.get(entityManagerContext);
  const form = await request.formData();
  const intent = String(form.get("intent"));
  const refuse = (result: ActionResult) => data(result, { status: 400 });
  try {
    switch (intent) {
      case "profile": {
        const parsed = profileForm.safeParse(formToObject(form));
        if (!parsed.success) return refuse({ intent, fields: fieldErrors(parsed.error) });
        await updateProfile(em, user.id, parsed.data);
        return { intent, message: "Saved." } satisfies ActionResult;
      }
      case "password": {
        const parsed = changePasswordForm.safeParse(formToObject(form));
        if (!parsed.success) return refuse({ intent, fields: fieldErrors(parsed.error) });
        await changePassword(em, user.id, { ...parsed.data, keepSessionId: user.sessionId });
        return { intent, message: "Password changed. Your other sessions were signed out." } satisfies ActionResult;
      }
      case "notices": {
        const preference = String(form.get("noticePreference"));
        if (preference !== "each" && preference !== "daily_digest" && preference !== "none") return refuse({ intent, error: "Choose how often to hear from us." });
        await setNoticePreference(em, user.id, preference);
        return { intent, message: "Saved." } satisfies ActionResult;
      }
      case "sign-out-everywhere": {
        await endAllSessions(em, user.id);
        const cookie = await endSession(em, request);
        return redirect("/login", { headers: { "Set-Cookie": cookie } });
      }
      case "create-token": {
        const parsed = apiTokenForm.safeParse(formToObject(form));
        if (!parsed.success) return refuse({ intent, fields: fieldErrors(parsed.error) });
        const { secret } = await createApiToken(em, user.id, parsed.data.label);
        return { intent, newToken: secret } satisfies ActionResult;
      }
      case "revoke-token": {
        await revokeApiToken(em, user.id, Number(form.get("tokenId")));
        return { intent, message: "Token revoked: it no longer works." } satisfies ActionResult;
      }
      default:
        return refuse({ intent, error: "Unknown action." });
    }
  } catch (error) {
    if (error instanceof AccountError) {
      return refuse({ intent, error: error.field ? undefined : error.message, fields: error.field ? { [error.field]: [error.message] } : undefined });
    }
    throw error;
  }
}

export default function Account({ loaderData, actionData }: Route.ComponentProps) {
  const { user, tokens } = loaderData;
  const result = actionData as ActionResult | undefined;
  const busy = useNavigation().state === "submitting";
  const for_ = (intent: string) => (result?.intent === intent ? result : undefined);
  return (
    <div className="max-w-2xl space-y-8">
      <header className="space-y-1">
        <h1 className="text-3xl">Your account</h1>
        <p className="text-ink-soft">
          {user.roles.length ? user.roles.map((r) => `${ROLE_LABELS[r]} (${ROLE_DUTIES[r]})`).join(" · ") : "No roles yet"}
        </p>
      </header>

      <section className="space-y-3">
        <h2 className="text-xl">Name and e-mail</h2>
        {for_("profile")?.message && <FormMessage tone="success">{for_("profile")?.message}</FormMessage>}
        <Form method="post" className="space-y-4">
          <input type="hidden" name="intent" value="profile" />
          <Field label="Name" name="name" defaultValue={user.name} autoComplete="name" errors={for_("profile")?.fields?.name} />
          <Field label="E-mail address" name="email" type="email" defaultValue={user.email} autoComplete="email" errors={for_("profile")?.fields?.email} />
          <PrimaryButton disabled={busy}>Save</PrimaryButton>
        </Form>
      </section>

      <section className="space-y-3">
        <h2 className="text-xl">What became of my visits</h2>
        {for_("notices")?.message && <FormMessage tone="success">{for_("notices")?.message}</FormMessage>}
        <Form method="post" className="space-y-3">
          <input type="hidden" name="intent" value="notices" />
          <fieldset className="space-y-1">
            <legend className="font-semibold">When a botanist or bee verifier decides about one of my visits, e-mail me</legend>
            {([["each", "each time"], ["daily_digest", "once a day, a summary"], ["none", "never"]] as const).map(([value, label]) => (
              <label key={value} className="flex min-h-11 items-center gap-2">
                <input type="radio" name="noticePreference" value={value} defaultChecked={user.noticePreference === value} className="h-5 w-5 accent-moss" />
                {label}
              </label>
            ))}
          </fieldset>
          <PrimaryButton disabled={busy}>Save</PrimaryButton>
        </Form>
      </section>

      <section className="space-y-3">
        <h2 className="text-xl">Password</h2>
        {for_("password")?.message && <FormMessage tone="success">{for_("password")?.message}</FormMessage>}
        <Form method="post" className="space-y-4">
          <input type="hidden" name="intent" value="password" />
          <Field label="Current password" name="currentPassword" type="password" autoComplete="current-password" errors={for_("password")?.fields?.currentPassword} />
          <Field label="New password" name="password" type="password" autoComplete="new-password" errors={for_("password")?.fields?.password} hint="At least 10 characters." />
          <Field label="New password again" name="confirmPassword" type="password" autoComplete="new-password" errors={for_("password")?.fields?.confirmPassword} />
          <PrimaryButton disabled={busy}>Change password</PrimaryButton>
        </Form>
      </section>

      <section className="space-y-3">
        <h2 className="text-xl">Personal API tokens</h2>
        <p className="text-[0.95rem] text-ink-soft">
          For scripts that read or write through the JSON API as you: send <code>Authorization: Bearer &lt;token&gt;</code>. A
          token acts with your roles; revoke it when the script no longer needs it.
        </p>
        {for_("create-token")?.newToken && (
          <FormMessage tone="success">
            <p className="font-semibold">Copy this token now; it will not be shown again.</p>
            <code data-testid="new-token" className="mt-1 block break-all rounded bg-white px-2 py-1 text-sm">
              {for_("create-token")?.newToken}
            </code>
          </FormMessage>
        )}
        {for_("revoke-token")?.message && <FormMessage tone="info">{for_("revoke-token")?.message}</FormMessage>}
        {for_("revoke-token")?.error && <FormMessage tone="error">{for_("revoke-token")?.error}</FormMessage>}
        {tokens.length > 0 && (
          <ul className="divide-y divide-ink/10 rounded-md border border-ink/10 bg-white/50">
            {tokens.map((t) => (
              <li key={t.id} className="flex flex-wrap items-center justify-between gap-2 px-3 py-2">
                <span>
                  <strong>{t.label}</strong> <code className="text-sm text-ink-soft">{t.prefix}…</code>
                  <span className="block text-sm text-ink-soft">
                    made {t.createdAt.slice(0, 10)} · {t.lastUsedAt ? `last used ${t.lastUsedAt.slice(0, 10)}` : "not used yet"}
                  </span>
                </span>
                <Form method="post">
                  <input type="hidden" name="intent" value="revoke-token" />
                  <input type="hidden" name="tokenId" value={t.id} />
                  <SecondaryButton>Revoke</SecondaryButton>
                </Form>
              </li>
            ))}
          </ul>
        )}
        <Form method="post" className="space-y-3">
          <input type="hidden" name="intent" value="create-token" />
          <Field label="Token name" name="label" placeholder="e.g. spreadsheet upload script" errors={for_("create-token")?.fields?.label} />
          <PrimaryButton disabled={busy}>Create a token</PrimaryButton>
        </Form>
      </section>

      <section className="space-y-3">
        <h2 className="text-xl">Sessions</h2>
        <p className="text-[0.95rem] text-ink-soft">Signed in on a shared or lost phone? End every session, this one included.</p>
        <Form method="post">
          <input type="hidden" name="intent" value="sign-out-everywhere" />
          <SecondaryButton>Sign out everywhere</SecondaryButton>
        </Form>
      </section>
    </div>
  );
}
