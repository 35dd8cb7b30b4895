import { Form, Link, NavLink, Outlet, useLocation } from "react-router";
import { memberMiddleware, requireArea } from "~/.server/guard";
import { PatinaMark } from "~/components/patina-mark";
import { currentNavTarget } from "~/lib/nav";
import { type Area, ROLE_LABELS, roleMayOpen } from "~/lib/roles";
import type { Route } from "./+types/app-layout";

type NavItem = { to: string; label: string; area: Area };

const NAV_GROUPS: Array<{ label: string; items: NavItem[] }> = [
  {
    label: "Today",
    items: [
      { to: "/", label: "Home", area: "home" },
      { to: "/visit", label: "Visit", area: "visit" },
    ],
  },
  {
    label: "Route book",
    items: [
      { to: "/pools", label: "Pools", area: "pools" },
      { to: "/routes", label: "Routes", area: "routebook" },
      { to: "/sources", label: "Fill sources", area: "routebook" },
      { to: "/products", label: "Products", area: "routebook" },
    ],
  },
  {
    label: "Analytics",
    items: [
      { to: "/overview", label: "Overview", area: "overview" },
      { to: "/recurring", label: "Recurring", area: "recurring" },
      { to: "/risk", label: "Risk", area: "risk" },
      { to: "/outlook", label: "Metal outlook", area: "outlook" },
      { to: "/outcomes", label: "Outcomes", area: "outcomes" },
      { to: "/sources/health", label: "Source health", area: "sources" },
    ],
  },
  {
    label: "Data",
    items: [
      { to: "/imports", label: "Imports", area: "imports" },
      { to: "/exports", label: "Exports", area: "exports" },
    ],
  },
  {
    label: "Company",
    items: [
      { to: "/team", label: "Team", area: "team" },
      { to: "/settings", label: "Settings", area: "settings" },
      { to: "/mailbox", label: "Mailbox", area: "mailbox" },
    ],
  },
];

/** Every page below resolves the member's scope once, here; loaders read it from the context. */
export const middleware: Route.MiddlewareFunction[] = [memberMiddleware];

export async function loader({ context }: Route.LoaderArgs) {
  const scope = requireArea(context, "home");
  return {
    userName: scope.userName,
    role: scope.role,
    companyName: scope.companyName,
    nav: NAV_GROUPS.map((group) => ({
      label: group.label,
      items: group.items.filter((item) => roleMayOpen(scope.role, item.area)),
    })).filter((group) => group.items.length > 0),
  };
}

export default function AppLayout({ loaderData }: Route.ComponentProps) {
  const { userName, role, companyName, nav } = loaderData;
  const { pathname } = useLocation();
  const current = currentNavTarget(pathname, nav.flatMap((group) => group.items.map((item) => item.to)));
  return (
    <div className="min-h-dvh">
      <header className="border-b border-line bg-white">
        <div className="mx-auto flex max-w-6xl items-center gap-4 px-4 py-3">
          <NavLink to="/" className="flex items-center gap-2" aria-label="Patina home">
            <PatinaMark className="size-8" />
            <span className="text-lg font-semibold tracking-tight">Patina</span>
          </NavLink>
          <div className="ml-auto flex items-center gap-3 text-sm">
            <span className="text-right leading-tight">
              <span className="block font-medium">{userName}</span>
              <span className="block text-xs text-muted">
                {ROLE_LABELS[role]} · {companyName}
              </span>
            </span>
            <Form method="post" action="/sign-out">
              <button type="submit" className="rounded-lg border border-line px-3 py-2 font-medium hover:bg-verdigris-50">
                Sign out
              </button>
            </Form>
          </div>
        </div>
      </header>
      <div className="mx-auto max-w-6xl lg:flex lg:gap-6 lg:px-4">
        {/* One landmark: a scrolling strip on phones, a sidebar from lg up. */}
        <nav
          aria-label="Main"
          className="overflow-x-auto border-b border-line bg-white lg:w-48 lg:shrink-0 lg:overflow-visible lg:border-0 lg:bg-transparent"
        >
          <div className="flex w-max items-center gap-1 px-3 py-2 lg:sticky lg:top-4 lg:w-auto lg:flex-col lg:items-stretch lg:px-0 lg:py-6">
            {nav.map((group, index) => (
              <div key={group.label} className="flex items-center gap-1 lg:flex-col lg:items-stretch">
                {index > 0 ? <span aria-hidden="true" className="mx-1 h-5 w-px bg-line lg:hidden" /> : null}
                <span className="hidden px-3 pt-4 pb-1 text-xs font-semibold tracking-wide text-muted uppercase lg:block">
                  {group.label}
                </span>
                {group.items.map((item) => (
                  <Link
                    key={item.to}
                    to={item.to}
                    aria-current={item.to === current ? "page" : undefined}
                    className={`rounded-lg px-3 py-2 text-sm font-medium whitespace-nowrap ${item.to === current ? "bg-verdigris-100 text-verdigris-900" : "text-muted hover:bg-verdigris-50 hover:text-ink"}`}
                  >
                    {item.label}
                  </Link>
                ))}
              </div>
            ))}
          </div>
        </nav>
        <main className="min-w-0 flex-1 px-4 py-6 lg:px-0">
          <Outlet />
        </main>
      </div>
    </div>
  );
}

export { ErrorPage as ErrorBoundary } from "~/components/error-panel";
