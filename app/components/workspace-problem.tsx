import { isRouteErrorResponse, Link } from "react-router";

/**
 * A workspace page that could not be shown (its record is missing, of another company, or not open to
 * the role), drawn inside the workspace layout so the navigation stays. Each workspace route that can
 * fail on its own data exports an ErrorBoundary that renders this.
 */
export function WorkspaceProblem({ error }: { error: unknown }) {
  const { status, title, detail } = describe(error);
  return (
    <section aria-labelledby="workspace-problem-title" className="mx-auto flex max-w-xl flex-col gap-3 card p-8">
      {/* React hoists this into <head>: no route's meta runs for a page that failed. */}
      <title>{`${title} · Emberwright`}</title>
      <p className="text-sm font-extrabold tracking-widest text-ember-700 uppercase">Error {status}</p>
      <h1 id="workspace-problem-title" className="text-2xl font-extrabold">
        {title}
      </h1>
      {detail ? <p className="text-char-600">{detail}</p> : null}
      <div className="mt-3 flex flex-wrap gap-3">
        <Link to="/app" className="btn-primary">
          Back to the workspace
        </Link>
      </div>
    </section>
  );
}

function describe(error: unknown): { status: number; title: string; detail?: string } {
  if (isRouteErrorResponse(error)) {
    if (error.status === 404)
      return {
        status: 404,
        title: "We could not find that",
        detail: "It may have been removed, the link may be old, or it may belong to another company.",
      };
    const detail = typeof error.data === "string" ? error.data : error.statusText;
    if (error.status === 403) return { status: 403, title: "This page is not open to your role", detail };
    return { status: error.status, title: "That did not work", detail };
  }
  if (import.meta.env.DEV && error instanceof Error)
    return { status: 500, title: "Something broke", detail: error.message };
  return {
    status: 500,
    title: "Something broke on our side",
    detail: "Please try again in a moment. If it keeps happening, tell us what you were doing.",
  };
}
