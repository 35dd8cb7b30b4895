import { Link } from "react-router";
import { requireArea } from "~/.server/guard";
import { listRoutes, ROUTE_SORTS } from "~/.server/routebook/queries/routes";
import type { Column } from "~/components/data-table";
import { archiveColumn, ArchiveStatusFilter, archivableListQuery, ListPage, nameColumn } from "~/components/routebook/list-table";
import { weekdayList } from "~/lib/weekdays";
import { roleMayOpen } from "~/lib/roles";
import type { Route } from "./+types/routes";

export const meta: Route.MetaFunction = () => [{ title: "Routes · Patina" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  const scope = requireArea(context, "routebook");
  const { params, active } = archivableListQuery(request, ROUTE_SORTS);
  const list = await listRoutes(scope, params, { active });
  return { ...list, params, mayEdit: roleMayOpen(scope.role, "routebookEdit") };
}

type Row = Route.ComponentProps["loaderData"]["rows"][number];

export default function Routes({ loaderData }: Route.ComponentProps) {
  const columns: Array<Column<Row>> = [
    nameColumn("Route", (r) => (loaderData.mayEdit ? `/routes/${r.id}/edit` : null)),
    { key: "weekdays", label: "Service days", sortKey: "weekdays", cell: (r) => weekdayList(r.serviceWeekdays) },
    { key: "technicians", label: "Technicians", cell: (r) => r.technicians ?? "nobody yet" },
    {
      key: "pools",
      label: "Pools",
      sortKey: "pools",
      numeric: true,
      cell: (r) => (
        <Link to={`/pools?route=${r.id}`} className="underline">
          {r.poolCount}
        </Link>
      ),
    },
    archiveColumn(),
  ];
  return (
    <ListPage title="Routes" nouns={["route", "routes"]} add={{ to: "/routes/new", label: "Add a route" }} list={loaderData} columns={columns}
      searchLabel="Search route names" emptyText="No routes here yet.">
      <ArchiveStatusFilter />
    </ListPage>
  );
}

export { ErrorPanel as ErrorBoundary } from "~/components/error-panel";
