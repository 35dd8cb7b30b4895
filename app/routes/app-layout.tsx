import { Form, NavLink, Outlet } from "react-router";
import { requireMember } from "~/.server/guard";
import { ErrorPanel } from "~/components/error-panel";
import { PatinaMark } from "~/components/patina-mark";
import { type Area, ROLE_LABELS, roleMayOpen } from "~/lib/roles";
import type { Route } from "./+types/app-layout";

const NAV: Array<{ to: string; label: string; area: Area }> = [
  { to: "/", label: "Home", area: "home" },
  { to: "/visit", label: "Visit", area: "visit" },
  { to: "/pools", label: "Pools", area: "pools" },
  { to: "/routes", label: "Routes", area: "routebook" },
  { to: "/sources", label: "Fill sources", area: "routebook" },
  { to: "/products", label: "Products", area: "routebook" },
  { to: "/overview", label: "Overview", area: "overview" },
  { to: "/recurring", label: "Recurring", area: "recurring" },
  { to: "/risk", label: "Risk", area: "risk" },
  { to: "/outcomes", label: "Outcomes", area: "outcomes" },
  { to: "/sources/health", label: "Source health", area: "sources" },
  { to: "/imports", label: "Imports", area: "imports" },
  { to: "/exports", label: "Exports", area: "exports" },
  { to: "/team", label: "Team", area: "team" },
  { to: "/settings", label: "Settings", area: "settings" },
  { to: "/mailbox", label: "Mailbox", area: "mailbox" },
];

export async function loader({ request }: Route.LoaderArgs) {
  const scope = await requireMember(request, "home");
  return {
    userName: scope.userName,
    role: scope.role,
    companyName: scope.companyName,
    nav: NAV.filter((item) => roleMayOpen(scope.role, item.area)),
  };
}

export default function AppLayout({ loaderData }: Route.ComponentProps) {
  const { userName, role, companyName, nav } = loaderData;
  return (
    <div className="min-h-dvh">
      <header className="border-b border-line bg-white">
        <div className="mx-auto flex max-w-5xl flex-wrap items-center gap-x-6 gap-y-2 px-4 py-3">
          <NavLink to="/" className="flex items-center gap-2" aria-label="Patina home">
            <PatinaMark className="size-8" />
            <span className="text-lg font-semibold tracking-tight">Patina</span>
          </NavLink>
          <nav aria-label="Main" className="order-3 flex w-full gap-1 overflow-x-auto sm:order-none sm:w-auto">
            {nav.map((item) => (
              <NavLink
                key={item.to}
                to={item.to}
                end={item.to === "/"}
                className={({ isActive }) =>
                  `rounded-lg px-3 py-2 text-sm font-medium ${isActive ? "bg-verdigris-100 text-verdigris-900" : "text-muted hover:bg-verdigris-50"}`
                }
              >
                {item.label}
              </NavLink>
            ))}
          </nav>
          <div className="ml-auto flex items-center gap-3 text-sm">
            <span className="hidden text-right sm:block">
              <span className="block font-medium">{userName}</span>
              <span className="block text-muted">
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
      <main className="mx-auto max-w-5xl px-4 py-6">
        <Outlet />
      </main>
    </div>
  );
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return (
    <main className="mx-auto max-w-xl p-6">
      <ErrorPanel error={error} />
    </main>
  );
}
