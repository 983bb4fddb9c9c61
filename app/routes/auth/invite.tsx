import { data, Form, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/invite";
import { entityManagerContext } from "~/db/orm.server";
import { acceptInvitation, AccountError, findUsableToken } from "~/auth/accounts.server";
import { acceptInvitationForm, fieldErrors, formToObject } from "~/auth/account-schemas";
import { startSession } from "~/auth/session.server";
import { ROLE_DUTIES, ROLE_LABELS } from "~/auth/roles";
import { Field, FormMessage, PrimaryButton } from "~/components/forms";

export const meta: Route.MetaFunction = () => [{ title: "Join · Visitwort" }];

export async function loader({ params, context }: Route.LoaderArgs) {
  const token = await findUsableToken(context.get(entityManagerContext), params.token, "invitation");
  if (!token) return { valid: false as const };
  return { valid: true as const, email: token.email, roles: [...token.roles], expiresAt: token.expiresAt.toISOString() };
}

export async function action({ params, request, context }: Route.ActionArgs) {
  const em = context.get(entityManagerContext);
  const parsed = acceptInvitationForm.safeParse(formToObject(await request.formData()));
  if (!parsed.success) return data({ fields: fieldErrors(parsed.error), error: undefined }, { status: 400 });
  try {
    const user = await acceptInvitation(em, params.token, parsed.data);
    const cookie = await startSession(em, user, request);
    return redirect("/account?welcome", { headers: { "Set-Cookie": cookie } });
  } catch (error) {
    if (error instanceof AccountError) return data({ fields: undefined, error: error.message }, { status: 400 });
    throw error;
  }
}

export default function Invite({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state === "submitting";
  if (!loaderData.valid) {
    return (
      <div className="mx-auto max-w-md space-y-3">
        <h1 className="text-3xl">This invitation cannot be used</h1>
        <p>It has been used already, was replaced by a newer one, or is more than 7 days old. Ask your coordinator to invite you again.</p>
      </div>
    );
  }
  return (
    <div className="mx-auto max-w-md space-y-5">
      <h1 className="text-3xl">Join the programme</h1>
      <p>
        You were invited as{" "}
        {loaderData.roles.map((r, i) => (
          <span key={r}>
            {i > 0 && " and "}
            <strong>{ROLE_LABELS[r]}</strong> ({ROLE_DUTIES[r]})
          </span>
        ))}
        , with the address <strong>{loaderData.email}</strong>.
      </p>
      {actionData?.error && <FormMessage tone="error">{actionData.error}</FormMessage>}
      <Form method="post" className="space-y-4">
        <Field label="Your name" name="name" autoComplete="name" errors={actionData?.fields?.name} hint="As the programme should credit your records." />
        <Field label="Choose a password" name="password" type="password" autoComplete="new-password" errors={actionData?.fields?.password} hint="At least 10 characters." />
        <Field label="The password again" name="confirmPassword" type="password" autoComplete="new-password" errors={actionData?.fields?.confirmPassword} />
        <PrimaryButton disabled={busy}>Join</PrimaryButton>
      </Form>
    </div>
  );
}
