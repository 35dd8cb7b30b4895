import { requireArea } from "~/.server/guard";
import { companyPreferences } from "~/.server/settings/queries/company-settings";
import { listPools, POOL_SORTS, POOL_STATUSES } from "~/.server/routebook/queries/pools";
import { routeOptions } from "~/.server/routebook/queries/routes";
import { sourceOptions } from "~/.server/routebook/queries/sources";
import { type Column, FilterSelect } from "~/components/data-table";
import { options } from "~/components/form-controls";
import { ListPage, NameCell } from "~/components/routebook/list-table";
import { filterOptions } from "~/lib/archived";
import { formatDate } from "~/lib/format";
import { SURFACES } from "~/lib/forms/routebook";
import { labelOf, SURFACE_LABELS } from "~/lib/labels";
import { enumFilter, idFilter, listParams } from "~/lib/list-params";
import { roleMayOpen } from "~/lib/roles";
import { formatVolume, VOLUME_UNIT } from "~/lib/units";
import type { Route } from "./+types/pools";

export const meta: Route.MetaFunction = () => [{ title: "Pools · Patina" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  const scope = requireArea(context, "pools");
  const url = new URL(request.url);
  const params = listParams(url, POOL_SORTS, "street");
  const filters = {
    routeId: idFilter(url, "route"),
    fillSourceId: idFilter(url, "source"),
    surface: enumFilter(url, "surface", SURFACES),
    status: enumFilter(url, "status", POOL_STATUSES) ?? "active",
  };
  const [list, routes, sources, prefs] = await Promise.all([
    listPools(scope, params, filters),
    routeOptions(scope),
    sourceOptions(scope),
    companyPreferences(scope),
  ]);
  return { ...list, params, routes, sources, units: prefs.units, timeZone: prefs.timeZone, mayEdit: roleMayOpen(scope.role, "routebookEdit") };
}

const POOL_STATUS_OPTIONS = [
  { value: "active", label: "In service" },
  { value: "archived", label: "Archived" },
  { value: "all", label: "All" },
];

type Row = Route.ComponentProps["loaderData"]["rows"][number];

export default function Pools({ loaderData }: Route.ComponentProps) {
  const { routes, sources, units, timeZone } = loaderData;
  const columns: Array<Column<Row>> = [
    { key: "street", label: "Pool", sortKey: "street", cell: (r) => <NameCell to={`/pools/${r.id}`}>{r.street}</NameCell> },
    { key: "account", label: "Account", sortKey: "account", wide: true, cell: (r) => r.accountCode },
    { key: "customer", label: "Customer", sortKey: "customer", cell: (r) => r.customerName },
    { key: "neighbourhood", label: "Neighbourhood", sortKey: "neighbourhood", wide: true, cell: (r) => r.neighbourhood ?? "—" },
    { key: "route", label: "Route", sortKey: "route", wide: true, cell: (r) => r.routeName ?? "no route" },
    { key: "source", label: "Fill water", wide: true, cell: (r) => r.fillSourceName ?? "unknown" },
    { key: "surface", label: "Surface", wide: true, cell: (r) => labelOf(SURFACE_LABELS, r.surface) },
    { key: "volume", label: `Volume (${VOLUME_UNIT[units]})`, sortKey: "volume", numeric: true, wide: true, cell: (r) => formatVolume(r.volumeLitres, units) },
    { key: "lastTest", label: "Last test", sortKey: "lastTest", cell: (r) => (r.active ? formatDate(r.lastTest, timeZone) : "archived") },
  ];
  return (
    <ListPage title="Pools" nouns={["pool", "pools"]} add={{ to: "/pools/new", label: "Add a pool" }} list={loaderData} columns={columns}
      searchLabel="Search address, customer or account" emptyText="No pools here yet.">
      <FilterSelect name="route" label="Route" allLabel="All routes" options={filterOptions(routes)} />
      <FilterSelect name="source" label="Fill water" allLabel="All sources" options={filterOptions(sources)} />
      <FilterSelect name="surface" label="Surface" allLabel="All surfaces" options={options(SURFACE_LABELS)} />
      <FilterSelect name="status" label="Status" options={POOL_STATUS_OPTIONS} />
    </ListPage>
  );
}

export { ErrorPanel as ErrorBoundary } from "~/components/error-panel";
