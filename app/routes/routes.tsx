import { Link } from "react-router";
import { requireArea } from "~/.server/guard";
import { listRoutes, ROUTE_SORTS } from "~/.server/routebook/queries/routes";
import { ButtonLink, type Column, ListFilters, PageHeader } from "~/components/data-table";
import { archiveColumn, ArchiveStatusFilter, countOf, ListTable, NameCell } from "~/components/routebook/list-table";
import { weekdayList } from "~/lib/weekdays";
import { activeWanted, ARCHIVE_STATUSES } from "~/lib/archived";
import { enumFilter, listParams } from "~/lib/list-params";
import { roleMayOpen } from "~/lib/roles";
import type { Route } from "./+types/routes";

export const meta: Route.MetaFunction = () => [{ title: "Routes · Patina" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  const scope = requireArea(context, "routebook");
  const url = new URL(request.url);
  const params = listParams(url, ROUTE_SORTS, "name");
  const status = enumFilter(url, "status", ARCHIVE_STATUSES) ?? "active";
  const list = await listRoutes(scope, params, { active: activeWanted(status) });
  return { ...list, params, mayEdit: roleMayOpen(scope.role, "routebookEdit") };
}

type Row = Route.ComponentProps["loaderData"]["rows"][number];

export default function Routes({ loaderData }: Route.ComponentProps) {
  const { rows, total, params, mayEdit } = loaderData;
  const columns: Array<Column<Row>> = [
    {
      key: "name",
      label: "Route",
      sortKey: "name",
      cell: (r) => <NameCell to={mayEdit ? `/routes/${r.id}/edit` : null}>{r.name}</NameCell>,
    },
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
    <div>
      <PageHeader title="Routes" action={mayEdit ? <ButtonLink to="/routes/new">Add a route</ButtonLink> : null}>
        {countOf(total, "route", "routes")}
      </PageHeader>
      <ListFilters searchLabel="Search route names">
        <ArchiveStatusFilter />
      </ListFilters>
      <ListTable caption="Routes" columns={columns} rows={rows} total={total} params={params} noun="route" emptyText="No routes here yet." />
    </div>
  );
}

export { ErrorPanel as ErrorBoundary } from "~/components/error-panel";
