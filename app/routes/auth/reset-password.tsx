import { data, Form, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/reset-password";
import { entityManagerContext } from "~/db/orm.server";
import { AccountError, findUsableToken, resetPassword } from "~/auth/accounts.server";
import { fieldErrors, formToObject, resetPasswordForm } from "~/auth/account-schemas";
import { Field, FormMessage, PrimaryButton } from "~/components/forms";

export const meta: Route.MetaFunction = () => [{ title: "Choose a new password · Visitwort" }];

export async function loader({ params, context }: Route.LoaderArgs) {
  const token = await findUsableToken(context.get(entityManagerContext), params.token, "password_reset");
  return { valid: token !== null };
}

export async function action({ params, request, context }: Route.ActionArgs) {
  const parsed = resetPasswordForm.safeParse(formToObject(await request.formData()));
  if (!parsed.success) return data({ fields: fieldErrors(parsed.error), error: undefined }, { status: 400 });
  try {
    await resetPassword(context.get(entityManagerContext), params.token, parsed.data.password);
    return redirect("/login?reset");
  } catch (error) {
    if (error instanceof AccountError) return data({ fields: undefined, error: error.message }, { status: 400 });
    throw error;
  }
}

export default function ResetPassword({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state === "submitting";
  if (!loaderData.valid) {
    return (
      <div className="mx-auto max-w-md space-y-3">
        <h1 className="text-3xl">This link cannot be used</h1>
        <p>
          Reset links work once and for one hour. <a href="/forgot-password">Ask for a new one.</a>
        </p>
      </div>
    );
  }
  return (
    <div className="mx-auto max-w-md space-y-5">
      <h1 className="text-3xl">Choose a new password</h1>
      {actionData?.error && <FormMessage tone="error">{actionData.error}</FormMessage>}
      <Form method="post" className="space-y-4">
        <Field label="New password" name="password" type="password" autoComplete="new-password" errors={actionData?.fields?.password} hint="At least 10 characters." />
        <Field label="The password again" name="confirmPassword" type="password" autoComplete="new-password" errors={actionData?.fields?.confirmPassword} />
        <PrimaryButton disabled={busy}>Save the new password</PrimaryButton>
      </Form>
    </div>
  );
}
