import { isRouteErrorResponse, useRouteError } from "react-router";
import { TextLink } from "~/components/text-link";

const headings: Record<number, string> = {
  401: "Please sign in",
  403: "This page is not part of your role",
  404: "Nothing here",
};

/**
 * The one error display shared by every route's error boundary; a page inside
 * the app frame exports it as its own (`export { ErrorPanel as ErrorBoundary }`).
 * It reads the error with `useRouteError`: the framework hands the error to a
 * boundary as a prop only when the route module declares the boundary itself.
 */
export function ErrorPanel() {
  const error = useRouteError();
  let status: number | undefined;
  let message = "Something went wrong on our side. Try again, and tell your administrator if it keeps happening.";
  if (isRouteErrorResponse(error)) {
    status = error.status;
    message = typeof error.data === "string" && error.data ? error.data : error.statusText || message;
  } else if (import.meta.env.DEV && error instanceof Error) {
    message = error.message;
  }
  const heading = (status && headings[status]) ?? "Something went wrong";
  return (
    <section role="alert" className="rounded-xl border border-line bg-white p-6 shadow-sm">
      {status ? <p className="text-sm font-semibold text-muted">Error {status}</p> : null}
      <h1 className="mt-1 text-xl font-semibold">{heading}</h1>
      <p className="mt-2 text-muted">{message}</p>
      <p className="mt-4">
        <TextLink to="/">Back to your home page</TextLink>
      </p>
    </section>
  );
}

/** The error panel on a page of its own, where no app frame is around it: the root, the member layout, the public pages. */
export function ErrorPage() {
  return (
    <main className="mx-auto max-w-xl p-6">
      <ErrorPanel />
    </main>
  );
}
