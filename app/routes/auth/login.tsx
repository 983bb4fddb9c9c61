import { data, Form, Link, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/login";
import { entityManagerContext } from "~/db/orm.server";
import { optionalUser } from "~/auth/permissions.server";
import { signIn, SignInRefused } from "~/auth/sign-in.server";
import { startSession } from "~/auth/session.server";
import { safeNextPath } from "~/http/redirects";
import { Field, FormMessage, PrimaryButton } from "~/components/forms";
import { readSetting } from "~/admin/settings.server";

export const meta: Route.MetaFunction = () => [{ title: "Sign in · Visitwort" }];

// A throttled sign-in says when to come back (Retry-After), on the document response too.
export function headers({ actionHeaders }: Route.HeadersArgs) {
  return actionHeaders;
}

export async function loader({ request, context }: Route.LoaderArgs) {
  const next = safeNextPath(new URL(request.url).searchParams.get("next"));
  if (optionalUser(context)) throw redirect(next);
  const openSignUp = await readSetting(context.get(entityManagerContext), "openSignUp");
  return { next, reset: new URL(request.url).searchParams.has("reset"), openSignUp };
}

export async function action({ request, context }: Route.ActionArgs) {
  const em = context.get(entityManagerContext);
  const form = await request.clone().formData();
  const next = safeNextPath(String(form.get("next") ?? ""));
  try {
    const user = await signIn(em, request);
    const cookie = await startSession(em, user, request);
    return redirect(next, { headers: { "Set-Cookie": cookie } });
  } catch (error) {
    if (error instanceof SignInRefused) {
      return data(
        { message: error.message, fields: error.fields, email: String(form.get("email") ?? "").slice(0, 320) },
        { status: error.retryAfterSeconds ? 429 : 400, headers: error.retryAfterSeconds ? { "Retry-After": String(error.retryAfterSeconds) } : undefined },
      );
    }
    throw error;
  }
}

export default function Login({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state === "submitting";
  return (
    <div className="mx-auto max-w-md space-y-5">
      <h1 className="text-3xl">Sign in</h1>
      {loaderData.reset && !actionData && <FormMessage tone="success">Your password was changed. Sign in with the new one.</FormMessage>}
      {actionData?.message && <FormMessage tone="error">{actionData.message}</FormMessage>}
      <Form method="post" className="space-y-4" noValidate>
        <input type="hidden" name="next" value={loaderData.next} />
        <Field label="E-mail address" name="email" type="email" autoComplete="username" required defaultValue={actionData?.email} errors={actionData?.fields?.email} />
        <Field label="Password" name="password" type="password" autoComplete="current-password" required errors={actionData?.fields?.password} />
        <PrimaryButton disabled={busy}>{busy ? "Signing in…" : "Sign in"}</PrimaryButton>
      </Form>
      <p className="text-sm">
        <Link to="/forgot-password">Forgotten your password?</Link>
      </p>
      <p className="text-sm text-ink-soft">
        {loaderData.openSignUp ? (
          <>
            New here? <Link to="/signup">Sign up as a recorder</Link>.
          </>
        ) : (
          "Accounts are made by invitation from your programme’s coordinator."
        )}
      </p>
    </div>
  );
}
