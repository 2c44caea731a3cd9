import { useEffect } from "react";
import { Form, NavLink, Outlet, redirect, useLoaderData, useNavigate } from "react-router";
import type { Route } from "./+types/app-layout";
import { Wordmark } from "~/components/brand-mark";
import { identityOf, requireUser } from "~/.server/access";
import { unreadCount } from "~/.server/review";

/** Every page inside the app shell is for a signed-in member: the rest go to sign in, or to start a team first. */
export const middleware: Route.MiddlewareFunction[] = [
  async ({ request, context }, next) => {
    await requireUser(request, context);
    // The framework hands middleware the page's URL, without a data request's `.data`.
    const { team } = (await identityOf(context))!;
    if (!team && new URL(request.url).pathname !== "/teams/new") throw redirect("/teams/new");
    return next();
  },
];

export async function loader({ context }: Route.LoaderArgs) {
  const { user, team, teams } = (await identityOf(context))!;
  return { user, team, teams, unread: team ? await unreadCount(user.id, team.teamId) : 0 };
}

const NAV = [
  { to: "/desk", label: "Desk" },
  { to: "/sheets", label: "Sheets" },
  { to: "/projects", label: "Projects" },
  { to: "/search", label: "Search" },
  { to: "/calculators", label: "Calculators" },
  { to: "/team", label: "Team" },
];

export default function AppLayout() {
  const { user, team, teams, unread } = useLoaderData<typeof loader>();
  const navigate = useNavigate();
  // "/" anywhere outside a text field goes to the search box.
  useEffect(() => {
    const onKey = (event: KeyboardEvent) => {
      if (event.key !== "/" || event.ctrlKey || event.metaKey || event.altKey) return;
      const target = event.target as HTMLElement | null;
      if (target && (target.isContentEditable || ["INPUT", "TEXTAREA", "SELECT"].includes(target.tagName))) return;
      event.preventDefault();
      const box = document.getElementById("search-box");
      if (box) box.focus();
      else navigate("/search?focus=1");
    };
    window.addEventListener("keydown", onKey);
    return () => window.removeEventListener("keydown", onKey);
  }, [navigate]);
  return (
    <div className="min-h-screen">
      <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:left-3 focus:top-3 focus:z-10 focus:rounded focus:bg-sheet focus:px-3 focus:py-2">
        Skip to content
      </a>
      <header className="border-b border-rule bg-sheet">
        <div className="mx-auto flex max-w-6xl items-center gap-4 px-4 py-3 sm:px-6">
          <NavLink to="/sheets" className="no-underline" aria-label="Sinewright — your sheets">
            <Wordmark />
          </NavLink>
          <nav aria-label="Main" className="hidden md:block">
            <NavItems unread={unread} listClassName="flex items-center gap-1" linkClassName="px-3 hover:bg-paper hover:text-ink" />
          </nav>
          <div className="ml-auto flex items-center gap-3">
            {team ? (
              teams.length > 1 ? (
                <Form method="post" action="/teams/switch" className="flex items-center gap-2">
                  <label htmlFor="team-switch" className="sr-only">
                    Team
                  </label>
                  <select id="team-switch" name="teamId" defaultValue={team.teamId} className="field-input !w-auto !py-1 text-sm">
                    {teams.map((t) => (
                      <option key={t.teamId} value={t.teamId}>
                        {t.teamName}
                      </option>
                    ))}
                  </select>
                  <button type="submit" className="btn btn-quiet !px-2 !py-1 text-xs">
                    Switch
                  </button>
                </Form>
              ) : (
                <span className="hidden text-sm text-ink-soft sm:inline">{team.teamName}</span>
              )
            ) : null}
            <details className="relative">
              <summary className="flex cursor-pointer list-none items-center gap-2 rounded-md px-2 py-1 text-sm hover:bg-paper">
                <span aria-hidden="true" className="grid h-7 w-7 place-items-center rounded-full bg-ink text-xs font-semibold text-sheet">
                  {initials(user.name)}
                </span>
                <span className="sr-only">Account menu for {user.name}</span>
              </summary>
              <div className="panel absolute right-0 z-20 mt-2 w-60 p-3 shadow-lg">
                <p className="text-sm font-semibold">{user.name}</p>
                <p className="truncate text-xs text-ink-faint">{user.email}</p>
                {team ? <p className="mt-1 text-xs text-ink-soft">{team.role} in {team.teamName}</p> : null}
                <hr className="my-3 border-rule" />
                <NavLink to="/settings" className="block rounded px-2 py-1.5 text-sm no-underline hover:bg-paper">
                  Settings and API keys
                </NavLink>
                <NavLink to="/teams/new" className="block rounded px-2 py-1.5 text-sm no-underline hover:bg-paper">
                  Start another team
                </NavLink>
                <Form method="post" action="/sign-out">
                  <button type="submit" className="mt-1 w-full rounded px-2 py-1.5 text-left text-sm hover:bg-paper">
                    Sign out
                  </button>
                </Form>
              </div>
            </details>
          </div>
        </div>
        <nav aria-label="Main, compact" className="border-t border-rule md:hidden">
          <NavItems unread={unread} listClassName="flex flex-wrap gap-0.5 px-2 py-2" linkClassName="block whitespace-nowrap px-2.5" />
        </nav>
      </header>
      <main id="main" className="mx-auto max-w-6xl px-4 py-8 sm:px-6">
        <Outlet />
      </main>
    </div>
  );
}

/** The main navigation, laid out in a row on wide screens and wrapped under the header on phones. */
function NavItems({ unread, listClassName, linkClassName }: { unread: number; listClassName: string; linkClassName: string }) {
  return (
    <ul className={listClassName}>
      {NAV.map((item) => (
        <li key={item.to}>
          <NavLink
            to={item.to}
            className={({ isActive }) =>
              `rounded-md py-1.5 text-sm no-underline ${linkClassName} ${isActive ? "bg-copper-wash font-semibold text-copper-deep" : "text-ink-soft"}`
            }
          >
            {item.label}
            {item.to === "/desk" && unread > 0 ? (
              <span className="ml-1 rounded-full bg-copper px-1.5 text-xs font-semibold text-white">
                {unread}
                <span className="sr-only"> new notices</span>
              </span>
            ) : null}
          </NavLink>
        </li>
      ))}
    </ul>
  );
}

function initials(name: string): string {
  return (
    name
      .split(/\s+/)
      .filter(Boolean)
      .slice(0, 2)
      .map((part) => part[0]!.toUpperCase())
      .join("") || "?"
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/route-error";
