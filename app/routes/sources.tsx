import { requireArea } from "~/.server/guard";
import { listSources, SOURCE_SORTS } from "~/.server/routebook/queries/sources";
import { ButtonLink, type Column, FilterSelect, ListFilters, PageHeader } from "~/components/data-table";
import { options } from "~/components/form-controls";
import { archiveColumn, ArchiveStatusFilter, countOf, ListTable, NameCell } from "~/components/routebook/list-table";
import { SOURCE_KINDS } from "~/lib/forms/routebook";
import { labelOf, SOURCE_KIND_LABELS } from "~/lib/labels";
import { activeWanted, ARCHIVE_STATUSES } from "~/lib/archived";
import { enumFilter, listParams } from "~/lib/list-params";
import { roleMayOpen } from "~/lib/roles";
import type { Route } from "./+types/sources";

export const meta: Route.MetaFunction = () => [{ title: "Fill sources · Patina" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  const scope = requireArea(context, "routebook");
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
    cell: (r) => <NameCell to={`/sources/${r.id}`}>{r.name}</NameCell>,
  },
  { key: "kind", label: "Kind", sortKey: "kind", cell: (r) => labelOf(SOURCE_KIND_LABELS, r.kind) },
  { key: "pools", label: "Pools fed", sortKey: "pools", numeric: true, cell: (r) => r.poolCount },
  { key: "lastTest", label: "Last source test", sortKey: "lastTest", cell: (r) => r.lastTest ?? "never tested" },
  archiveColumn(),
];

export default function Sources({ loaderData }: Route.ComponentProps) {
  const { rows, total, params, mayEdit } = loaderData;
  return (
    <div>
      <PageHeader title="Fill sources" action={mayEdit ? <ButtonLink to="/sources/new">Add a source</ButtonLink> : null}>
        Where each pool's top-up water comes from · {countOf(total, "source", "sources")}
      </PageHeader>
      <ListFilters searchLabel="Search source names">
        <FilterSelect name="kind" label="Kind" allLabel="All kinds" options={options(SOURCE_KIND_LABELS)} />
        <ArchiveStatusFilter />
      </ListFilters>
      <ListTable caption="Fill sources" columns={columns} rows={rows} total={total} params={params} noun="source" emptyText="No fill sources here yet." />
    </div>
  );
}

export { ErrorPanel as ErrorBoundary } from "~/components/error-panel";
