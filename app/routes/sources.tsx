import { Link } from "react-router";
import { requireMember } from "~/.server/guard";
import { listSources, SOURCE_SORTS } from "~/.server/queries/routebook-sources";
import { ButtonLink, type Column, DataTable, FilterSelect, ListFilters, PageHeader } from "~/components/data-table";
import { ErrorPanel } from "~/components/error-panel";
import { options } from "~/components/form-controls";
import { SOURCE_KINDS } from "~/lib/forms/routebook";
import { labelOf, SOURCE_KIND_LABELS } from "~/lib/labels";
import { activeWanted, ARCHIVE_STATUS_OPTIONS, ARCHIVE_STATUSES } from "~/lib/archived";
import { enumFilter, listParams } from "~/lib/list-params";
import { roleMayOpen } from "~/lib/roles";
import type { Route } from "./+types/sources";

export const meta: Route.MetaFunction = () => [{ title: "Fill sources · Patina" }];

export async function loader({ request }: Route.LoaderArgs) {
  const scope = await requireMember(request, "routebook");
  const url = new URL(request.url);
  const params = listParams(url, SOURCE_SORTS, "name");
  const status = enumFilter(url, "status", ARCHIVE_STATUSES) ?? "active";
  const list = await listSources(scope, params, { kind: enumFilter(url, "kind", SOURCE_KINDS), active: activeWanted(status) });
  return { ...list, params, mayEdit: roleMayOpen(scope.role, "routebookEdit") };
}

type Row = Route.ComponentProps["loaderData"]["rows"][number];

const columns: Array<Column<Row>> = [
  {
    key: "name",
    label: "Source",
    sortKey: "name",
    cell: (r) => (
      <Link to={`/sources/${r.id}`} className="font-medium text-verdigris-700 underline">
        {r.name}
      </Link>
    ),
  },
  { key: "kind", label: "Kind", sortKey: "kind", cell: (r) => labelOf(SOURCE_KIND_LABELS, r.kind) },
  { key: "pools", label: "Pools fed", sortKey: "pools", numeric: true, cell: (r) => r.poolCount },
  { key: "lastTest", label: "Last source test", sortKey: "lastTest", cell: (r) => r.lastTest ?? "never tested" },
  { key: "active", label: "Status", wide: true, cell: (r) => (r.active ? "In use" : "Archived") },
];

export default function Sources({ loaderData }: Route.ComponentProps) {
  const { rows, total, params, mayEdit } = loaderData;
  return (
    <div>
      <PageHeader title="Fill sources" action={mayEdit ? <ButtonLink to="/sources/new">Add a source</ButtonLink> : null}>
        Where each pool's top-up water comes from · {total} {total === 1 ? "source" : "sources"}
      </PageHeader>
      <ListFilters searchLabel="Search source names">
        <FilterSelect name="kind" label="Kind" allLabel="All kinds" options={options(SOURCE_KIND_LABELS)} />
        <FilterSelect name="status" label="Status" options={ARCHIVE_STATUS_OPTIONS} />
      </ListFilters>
      <DataTable
        caption="Fill sources"
        columns={columns}
        rows={rows}
        rowKey={(r) => r.id}
        total={total}
        sort={params.sort}
        dir={params.dir}
        page={params.page}
        empty={params.q ? `No source matches "${params.q}".` : "No fill sources here yet."}
      />
    </div>
  );
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <ErrorPanel error={error} />;
}
