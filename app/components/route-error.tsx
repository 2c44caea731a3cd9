import { isRouteErrorResponse, useRouteError } from "react-router";

const STATUS_MESSAGES: Record<number, { title: string; body: string }> = {
  400: { title: "That request could not be understood", body: "Check what you entered and try again." },
  401: { title: "Please sign in", body: "This page is for signed-in team members." },
  403: { title: "Not allowed for your role", body: "Your role in this team does not allow this. An admin of the team can change roles." },
  404: { title: "Nothing here", body: "The page or record does not exist, or belongs to a team you are not in." },
  429: { title: "Too many attempts", body: "Wait a minute, then try again." },
};

/** The one error boundary: friendly words per status, never a stack trace. */
export function RouteErrorBoundary() {
  const error = useRouteError();
  let status = 500;
  let detail: string | undefined;
  if (isRouteErrorResponse(error)) {
    status = error.status;
    // Only short plain-text reasons written for people (403 and 400 messages) are shown.
    detail = typeof error.data === "string" && error.data.length > 0 && error.data.length < 300 ? error.data : undefined;
  }
  const message = STATUS_MESSAGES[status] ?? {
    title: "Something went wrong on our side",
    body: "The error has been logged. Nothing you entered was half-saved: try again, or go back.",
  };
  return (
    <main className="mx-auto max-w-xl px-6 py-24">
      <p className="eyebrow">Error {status}</p>
      <h1 className="mt-2 font-serif text-3xl font-semibold">{message.title}</h1>
      <p className="mt-4 text-ink-soft">{detail ?? message.body}</p>
      <p className="mt-8">
        <a className="btn btn-quiet" href="/">
          Back to the start page
        </a>
      </p>
    </main>
  );
}
