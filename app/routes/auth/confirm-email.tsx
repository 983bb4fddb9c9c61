import { data, Form, redirect } from "react-router";
import type { Route } from "./+types/confirm-email";
import { entityManagerContext } from "~/db/orm.server";
import { AccountError, confirmEmail, findUsableToken } from "~/auth/accounts.server";
import { startSession } from "~/auth/session.server";
import { FormMessage, PrimaryButton } from "~/components/forms";

export const meta: Route.MetaFunction = () => [{ title: "Confirm your e-mail address · Visitwort" }];

export async function loader({ params, context }: Route.LoaderArgs) {
  const token = await findUsableToken(context.get(entityManagerContext), params.token, "email_confirmation");
  return { valid: token !== null, email: token?.email ?? null };
}

// Confirming is a button press (POST), not the link itself: mail scanners open links too.
export async function action({ params, request, context }: Route.ActionArgs) {
  const em = context.get(entityManagerContext);
  try {
    const user = await confirmEmail(em, params.token);
    const cookie = await startSession(em, user, request);
    return redirect("/account?welcome", { headers: { "Set-Cookie": cookie } });
  } catch (error) {
    if (error instanceof AccountError) return data({ error: error.message }, { status: 400 });
    throw error;
  }
}

export default function ConfirmEmail({ loaderData, actionData }: Route.ComponentProps) {
  if (!loaderData.valid) {
    return (
      <div className="mx-auto max-w-md space-y-3">
        <h1 className="text-3xl">This link cannot be used</h1>
        <p>It was used already or is more than 48 hours old. <a href="/signup">Sign up again</a> to get a new one.</p>
      </div>
    );
  }
  return (
    <div className="mx-auto max-w-md space-y-5">
      <h1 className="text-3xl">Confirm your e-mail address</h1>
      {actionData?.error && <FormMessage tone="error">{actionData.error}</FormMessage>}
      <p>
        Confirm that <strong>{loaderData.email}</strong> is yours, and you are signed in.
      </p>
      <Form method="post">
        <PrimaryButton>Confirm</PrimaryButton>
      </Form>
    </div>
  );
}
