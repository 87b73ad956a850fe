import { Form, Link, data, redirect, useActionData, useNavigation } from "react-router";
import { callAuthEndpoint } from "~/lib/auth/auth.server";
import { getUser } from "~/lib/auth/authorize.server";
import { INVITATION_HEADER, signUpRefusal } from "~/lib/auth/sign-up-policy.server";
import { signUpMode } from "~/lib/config.server";
import { fieldErrors, formObject, signUpSchema, type FieldErrors } from "~/lib/auth/forms";
import { TextField } from "~/lib/auth/text-field";
import type { Route } from "./+types/sign-up";
import { withDependencies } from "~/lib/http.server";

export function meta() {
  return [{ title: "Create an account — Strutwise" }];
}

export const loader = withDependencies(async function loader({ request }: Route.LoaderArgs) {
  if (await getUser(request)) throw redirect("/projects");
  const mode = signUpMode();
  return {
    email: new URL(request.url).searchParams.get("email") ?? "",
    invitation: new URL(request.url).searchParams.get("invitation") ?? "",
    rule:
      mode.kind === "open"
        ? "Anyone may create an account here."
        : mode.kind === "domain"
          ? `Accounts are for addresses at ${mode.domains.join(", ")}, and for invited addresses.`
          : "Accounts are by invitation: use the address an administrator invited.",
  };
});

export const action = withDependencies(async function action({ request }: Route.ActionArgs) {
  const values = formObject(await request.formData());
  const parsed = signUpSchema.safeParse(values);
  const keep = { name: values.name ?? "", email: values.email ?? "" };
  if (!parsed.success) return data({ errors: fieldErrors(parsed.error), ...keep }, { status: 400 });
  const invitation = values.invitation ?? "";
  const refusal = await signUpRefusal(parsed.data.email, undefined, invitation);
  if (refusal) return data({ errors: { email: refusal } as FieldErrors, ...keep }, { status: 403 });
  // after the link, the new session lands on the desk's front page
  const res = await callAuthEndpoint(request, "/sign-up/email", { ...parsed.data, callbackURL: "/?verified=1" }, { [INVITATION_HEADER]: invitation });
  if (res.status === 200) return data({ errors: {} as FieldErrors, ...keep, sent: true });
  const errors: FieldErrors = {};
  const code = String(res.data?.code ?? "");
  if (code === "SIGN_UP_CLOSED") errors.email = String(res.data?.message ?? "Accounts on this desk are by invitation");
  else if (res.status === 429) errors.form = `Too many attempts from here. Wait ${res.retryAfter ?? 60} seconds.`;
  else if (code.includes("USER_ALREADY_EXISTS")) errors.email = "An account with this e-mail exists already. Sign in, or reset its password.";
  else if (code.includes("PASSWORD")) errors.password = "Choose a password of 10 to 128 characters.";
  else errors.form = "The account could not be created. Check the fields and try again.";
  return data({ errors, ...keep }, { status: res.status === 429 ? 429 : 400 });
});

export default function SignUp({ loaderData }: Route.ComponentProps) {
  const result = useActionData<typeof action>();
  if (result && "sent" in result && result.sent) {
    return (
      <section className="mx-auto max-w-md">
        <h1 className="text-3xl font-semibold tracking-tight">Check your mail</h1>
        <p role="status" className="card mt-6">
          If {result.email} may have an account here, a message with a confirmation link is on its way
          to it. Open the link within 24 hours; the account can do nothing until then. An
          invitation's role applies once the address is confirmed.
        </p>
      </section>
    );
  }
  const busy = useNavigation().state === "submitting";
  const errors = result?.errors ?? {};
  return (
    <section className="mx-auto max-w-md">
      <h1 className="text-3xl font-semibold tracking-tight">Create an account</h1>
      <p className="mt-2 text-ink-soft">
        {loaderData.rule} Every new account confirms its e-mail address by a link before it can
        do anything; projects then show up as their members add you. If an administrator invited
        your address with a role, the account gets that role once the address is confirmed.
      </p>
      <Form method="post" className="card mt-6 space-y-4" noValidate>
        {errors.form && <p role="alert" className="rounded-md bg-bad-wash px-3 py-2 text-sm text-bad">{errors.form}</p>}
        <input type="hidden" name="invitation" value={loaderData.invitation} />
        <TextField label="Name" name="name" autoComplete="name" defaultValue={result?.name} error={errors.name} autoFocus required />
        <TextField label="E-mail" name="email" type="email" autoComplete="email" defaultValue={result?.email || loaderData.email} error={errors.email} required />
        <TextField label="Password" name="password" type="password" autoComplete="new-password" error={errors.password} hint="At least 10 characters." required />
        <button type="submit" className="btn btn-primary w-full" disabled={busy}>Create account</button>
        <p className="text-sm">Have an account? <Link to="/sign-in" className="text-info underline">Sign in</Link></p>
      </Form>
    </section>
  );
}
