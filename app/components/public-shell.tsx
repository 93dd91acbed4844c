import type { ReactNode } from "react";
import { Link } from "react-router";
import { Wordmark } from "~/components/brand-mark";

/** Header and footer of the public pages (landing, sign-in, a contractor's page). */
export function PublicShell({ children, right }: { children: ReactNode; right?: ReactNode }) {
  return (
    <div className="flex min-h-dvh flex-col">
      <header className="border-b border-ash-200 bg-ash-50/90">
        <div className="mx-auto flex max-w-6xl items-center justify-between gap-4 px-4 py-3 sm:px-6">
          <Link to="/" aria-label="Emberwright home">
            <Wordmark />
          </Link>
          <nav aria-label="Site" className="flex items-center gap-2 text-sm font-bold">
            {right ?? (
              <Link to="/login" className="btn-quiet">
                Sign in
              </Link>
            )}
          </nav>
        </div>
      </header>
      <div className="flex-1">{children}</div>
      <footer className="border-t border-ash-200 bg-ash-100">
        <div className="mx-auto max-w-6xl px-4 py-6 text-sm text-char-600 sm:px-6">
          <p>
            Emberwright prices and plans round masonry fire pits. Fire rules differ from town to town: check with your
            local fire authority and building codes before you build.
          </p>
        </div>
      </footer>
    </div>
  );
}
