// A page's error boundary: the status in words, never a stack trace. Thrown Responses carry
// the API's { error } JSON (lib/http.server), which is the sentence shown.
import { isRouteErrorResponse, Link, useRouteError } from "react-router";

export function RouteError({ what = "page" }: { what?: string }) {
  const error = useRouteError();
  let title = `This ${what} could not be shown`;
  let text = "Something went wrong on our side. Try again in a moment; if it keeps happening, tell an admin.";
  if (isRouteErrorResponse(error)) {
    const said = typeof error.data === "string" ? error.data : (error.data as { error?: string } | null)?.error;
    if (error.status === 404) {
      title = `No such ${what}`;
      text = said || `There is no ${what} at this address. It may have been removed, or the link is mistyped.`;
    } else if (error.status === 403) {
      title = "Not for your role";
      text = said || "Your role does not allow this. An admin can change your role.";
    } else if (error.status === 401) {
      title = "Sign in first";
      text = said || "Your session has ended.";
    } else if (said) {
      text = said;
    }
  }
  return (
    <section className="max-w-2xl" role="alert">
      <h1 className="text-2xl font-semibold">{title}</h1>
      <p className="mt-3 text-ink-soft">{text}</p>
      <Link to="/" className="btn btn-secondary mt-6">
        Back to the desk
      </Link>
    </section>
  );
}
