import { Link } from "react-router";
import { requireMember } from "~/.server/guard";
import { listRoutes, ROUTE_SORTS } from "~/.server/queries/routebook-routes";
import { ButtonLink, type Column, DataTable, ListFilters, PageHeader } from "~/components/data-table";
import { ErrorPanel } from "~/components/error-panel";
import { weekdayList } from "~/lib/weekdays";
import { listParams } from "~/lib/list-params";
import { roleMayOpen } from "~/lib/roles";
import type { Route } from "./+types/route-list";

export const meta: Route.MetaFunction = () => [{ title: "Routes · Patina" }];

export async function loader({ request }: Route.LoaderArgs) {
  const scope = await requireMember(request, "routebook");
  const params = listParams(new URL(request.url), ROUTE_SORTS, "name");
  const list = await listRoutes(scope, params);
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
  ];
  return (
    <div>
      <PageHeader title="Routes" action={mayEdit ? <ButtonLink to="/routes/new">Add a route</ButtonLink> : null}>
        {total} {total === 1 ? "route" : "routes"}
      </PageHeader>
      <ListFilters searchLabel="Search route names" />
      <DataTable
        caption="Routes"
        columns={columns}
        rows={rows}
        rowKey={(r) => r.id}
        total={total}
        sort={params.sort}
        dir={params.dir}
        page={params.page}
        empty={params.q ? `No route matches "${params.q}".` : "No routes yet."}
      />
    </div>
  );
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <ErrorPanel error={error} />;
}
