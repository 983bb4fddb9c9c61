import { data, Form, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/forgot-password";
import { entityManagerContext } from "~/db/orm.server";
import { publicOrigin, requestPasswordReset } from "~/auth/accounts.server";
import { email, fieldErrors, formToObject } from "~/auth/account-schemas";
import { Field, FormMessage, PrimaryButton } from "~/components/forms";

export const meta: Route.MetaFunction = () => [{ title: "Reset your password · Visitwort" }];

const forgotForm = z.object({ email });

export async function action({ request, context }: Route.ActionArgs) {
  const parsed = forgotForm.safeParse(formToObject(await request.formData()));
  if (!parsed.success) return data({ sent: false, fields: fieldErrors(parsed.error) }, { status: 400 });
  await requestPasswordReset(context.get(entityManagerContext), { email: parsed.data.email, origin: publicOrigin(request) });
  // The same answer whether or not the address has an account.
  return { sent: true, fields: undefined };
}

export default function ForgotPassword({ actionData }: Route.ComponentProps) {
  const busy = useNavigation().state === "submitting";
  return (
    <div className="mx-auto max-w-md space-y-5">
      <h1 className="text-3xl">Reset your password</h1>
      {actionData?.sent ? (
        <FormMessage tone="success">
          If an account uses that address, a link to choose a new password is on its way. It works once, for one hour.
        </FormMessage>
      ) : (
        <Form method="post" className="space-y-4" noValidate>
          <Field label="E-mail address" name="email" type="email" autoComplete="email" errors={actionData?.fields?.email} />
          <PrimaryButton disabled={busy}>Send a reset link</PrimaryButton>
        </Form>
      )}
    </div>
  );
}
