import { Link } from "react-router";
import { requireMember } from "~/.server/guard";
import { listRoutes, ROUTE_SORTS } from "~/.server/queries/routebook-routes";
import { ButtonLink, type Column, DataTable, FilterSelect, ListFilters, PageHeader } from "~/components/data-table";
import { ErrorPanel } from "~/components/error-panel";
import { weekdayList } from "~/lib/weekdays";
import { activeWanted, ARCHIVE_STATUS_OPTIONS, ARCHIVE_STATUSES } from "~/lib/archived";
import { enumFilter, listParams } from "~/lib/list-params";
import { roleMayOpen } from "~/lib/roles";
import type { Route } from "./+types/route-list";

export const meta: Route.MetaFunction = () => [{ title: "Routes · Patina" }];

export async function loader({ request }: Route.LoaderArgs) {
  const scope = await requireMember(request, "routebook");
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
      cell: (r) =>
        mayEdit ? (
          <Link to={`/routes/${r.id}/edit`} className="font-medium text-verdigris-700 underline">
            {r.name}
          </Link>
        ) : (
          <span className="font-medium">{r.name}</span>
        ),
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
    { key: "active", label: "Status", wide: true, cell: (r) => (r.active ? "In use" : "Archived") },
  ];
  return (
    <div>
      <PageHeader title="Routes" action={mayEdit ? <ButtonLink to="/routes/new">Add a route</ButtonLink> : null}>
        {total} {total === 1 ? "route" : "routes"}
      </PageHeader>
      <ListFilters searchLabel="Search route names">
        <FilterSelect name="status" label="Status" options={ARCHIVE_STATUS_OPTIONS} />
      </ListFilters>
      <DataTable
        caption="Routes"
        columns={columns}
        rows={rows}
        rowKey={(r) => r.id}
        total={total}
        sort={params.sort}
        dir={params.dir}
        page={params.page}
        empty={params.q ? `No route matches "${params.q}".` : "No routes here yet."}
      />
    </div>
  );
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <ErrorPanel error={error} />;
}
