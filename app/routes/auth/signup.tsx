import { data, Form, Link, useNavigation } from "react-router";
import type { Route } from "./+types/signup";
import { entityManagerContext } from "~/db/orm.server";
import { AccountError, publicOrigin, signUp } from "~/auth/accounts.server";
import { fieldErrors, formToObject, signUpForm } from "~/auth/account-schemas";
import { readSetting } from "~/admin/settings.server";
import { Field, FormMessage, PrimaryButton } from "~/components/forms";

export const meta: Route.MetaFunction = () => [{ title: "Sign up · Visitwort" }];

export async function loader({ context }: Route.LoaderArgs) {
  return { open: await readSetting(context.get(entityManagerContext), "openSignUp") };
}

export async function action({ request, context }: Route.ActionArgs) {
  const parsed = signUpForm.safeParse(formToObject(await request.formData()));
  if (!parsed.success) return data({ sent: false, error: undefined, fields: fieldErrors(parsed.error) }, { status: 400 });
  try {
    await signUp(context.get(entityManagerContext), { ...parsed.data, origin: publicOrigin(request) });
  } catch (error) {
    if (error instanceof AccountError) return data({ sent: false, error: error.message, fields: undefined }, { status: 400 });
    throw error;
  }
  return { sent: true, error: undefined, fields: undefined };
}

export default function SignUp({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state === "submitting";
  if (!loaderData.open) {
    return (
      <div className="mx-auto max-w-md space-y-3">
        <h1 className="text-3xl">Joining is by invitation</h1>
        <p>This programme’s coordinators invite new recorders. Ask them for an invitation, or <Link to="/login">sign in</Link>.</p>
      </div>
    );
  }
  return (
    <div className="mx-auto max-w-md space-y-5">
      <h1 className="text-3xl">Sign up as a recorder</h1>
      {actionData?.sent ? (
        <FormMessage tone="success">
          Nearly there: we sent a link to confirm your e-mail address. Open it within 48 hours, then sign in.
        </FormMessage>
      ) : (
        <>
          <p className="text-ink-soft">Recorders note which flowers bees visit. A coordinator can give you other roles later.</p>
          {actionData?.error && <FormMessage tone="error">{actionData.error}</FormMessage>}
          <Form method="post" className="space-y-4" noValidate>
            <Field label="Your name" name="name" autoComplete="name" errors={actionData?.fields?.name} hint="As the programme should credit your records." />
            <Field label="E-mail address" name="email" type="email" autoComplete="email" errors={actionData?.fields?.email} />
            <Field label="Choose a password" name="password" type="password" autoComplete="new-password" errors={actionData?.fields?.password} hint="At least 10 characters." />
            <Field label="The password again" name="confirmPassword" type="password" autoComplete="new-password" errors={actionData?.fields?.confirmPassword} />
            <PrimaryButton disabled={busy}>Sign up</PrimaryButton>
          </Form>
        </>
      )}
    </div>
  );
}
