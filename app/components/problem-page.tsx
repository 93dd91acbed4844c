import { Link } from "react-router";
import { Wordmark } from "~/components/brand-mark";

/** The page shown for 404s and errors, in the product's look. */
export function ProblemPage({
  status,
  title,
  detail,
  stack,
}: {
  status: number;
  title: string;
  detail?: string;
  stack?: string;
}) {
  return (
    <main className="mx-auto flex min-h-dvh max-w-xl flex-col justify-center gap-6 px-6 py-16">
      {/* Shown from the root error boundary, where no route's meta runs: React hoists this into <head>. */}
      <title>{`${title} · Emberwright`}</title>
      <Link to="/" aria-label="Emberwright home">
        <Wordmark />
      </Link>
      <div className="card p-8">
        <p className="text-sm font-extrabold tracking-widest text-ember-600 uppercase">Error {status}</p>
        <h1 className="mt-2 text-2xl font-extrabold">{title}</h1>
        {detail ? <p className="mt-3 text-char-600">{detail}</p> : null}
        {stack ? <pre className="mt-4 max-h-64 overflow-auto rounded bg-ash-100 p-3 text-xs">{stack}</pre> : null}
        <div className="mt-6 flex flex-wrap gap-3">
          <Link to="/" className="btn-primary">
            Go to the home page
          </Link>
          <Link to="/app" className="btn-quiet">
            Open the workspace
          </Link>
        </div>
      </div>
    </main>
  );
}
