import type { ReactNode } from "react";
import { Form, Link, NavLink } from "react-router";
import { Wordmark } from "~/components/brand-mark";
import type { Role } from "~/db/enums";

type NavItem = { to: string; label: string; roles: Role[] };

/** The workspace's sections and who sees each; loaders enforce the same roles on the server. */
export const WORKSPACE_NAV: NavItem[] = [
  { to: "/app/inbox", label: "Inbox", roles: ["owner", "estimator"] },
  { to: "/app/jobs", label: "Jobs", roles: ["crew"] },
  { to: "/app/schedule", label: "Schedule", roles: ["owner", "estimator"] },
  { to: "/app/supplier-orders", label: "Orders", roles: ["owner"] },
  { to: "/app/reports", label: "Reports", roles: ["owner"] },
  { to: "/app/catalog", label: "Catalog", roles: ["owner", "estimator", "crew"] },
  { to: "/app/team", label: "Team", roles: ["owner"] },
  { to: "/app/settings", label: "Company settings", roles: ["owner"] },
];

export const ROLE_LABEL: Record<Role, string> = {
  owner: "Owner",
  estimator: "Estimator",
  crew: "Crew",
  homeowner: "Homeowner",
};

export function WorkspaceShell({
  user,
  companyName,
  children,
}: {
  user: { name: string; role: Role };
  companyName: string;
  children: ReactNode;
}) {
  const items = WORKSPACE_NAV.filter((item) => item.roles.includes(user.role));
  return (
    <div className="flex min-h-dvh flex-col">
      <a
        href="#content"
        className="no-print sr-only focus:not-sr-only focus:absolute focus:top-3 focus:left-3 focus:z-50 focus:rounded-lg focus:bg-white focus:px-4 focus:py-2 focus:font-bold focus:text-char-900 focus:shadow"
      >
        Skip to the content
      </a>
      <header className="no-print bg-char-900 text-ash-100">
        <div className="mx-auto flex max-w-7xl flex-wrap items-center justify-between gap-3 px-4 py-3 sm:px-6">
          <div className="flex items-center gap-4">
            <Link to="/app" aria-label="Emberwright workspace">
              <Wordmark tone="light" />
            </Link>
            <span className="hidden rounded-full bg-char-700 px-3 py-1 text-xs font-bold text-ash-200 sm:inline">
              {companyName}
            </span>
          </div>
          <div className="flex items-center gap-3 text-sm">
            <span className="text-right leading-tight">
              <span className="block font-bold text-ash-50">{user.name}</span>
              <span className="block text-xs text-ash-400">{ROLE_LABEL[user.role]}</span>
            </span>
            <Form method="post" action="/logout">
              <button type="submit" className="btn border border-char-600 text-ash-100 hover:bg-char-700">
                Sign out
              </button>
            </Form>
          </div>
        </div>
        <nav aria-label="Workspace" className="border-t border-char-700">
          {/* Wraps on a phone: a sideways-scrolling strip hid the last sections past the screen's edge. */}
          <ul className="mx-auto flex max-w-7xl flex-wrap gap-x-1 px-2 sm:px-4">
            {items.map((item) => (
              <li key={item.to}>
                <NavLink
                  to={item.to}
                  className={({ isActive }) =>
                    `block border-b-3 px-2.5 py-2.5 text-sm font-bold whitespace-nowrap sm:px-3 ${
                      isActive ? "border-ember-400 text-ash-50" : "border-transparent text-ash-400 hover:text-ash-100"
                    }`
                  }
                >
                  {item.label}
                </NavLink>
              </li>
            ))}
          </ul>
        </nav>
      </header>
      <main id="content" tabIndex={-1} className="mx-auto w-full max-w-7xl flex-1 px-4 py-6 outline-none sm:px-6">
        {children}
      </main>
    </div>
  );
}
