import { requireArea } from "~/.server/guard";
import { listSources, SOURCE_SORTS } from "~/.server/routebook/queries/sources";
import { type Column, FilterSelect } from "~/components/data-table";
import { options } from "~/components/form-controls";
import { archiveColumn, ArchiveStatusFilter, archivableListQuery, ListPage, nameColumn } from "~/components/routebook/list-table";
import { SOURCE_KINDS } from "~/lib/forms/routebook";
import { labelOf, SOURCE_KIND_LABELS } from "~/lib/labels";
import { enumFilter } from "~/lib/list-params";
import { roleMayOpen } from "~/lib/roles";
import type { Route } from "./+types/sources";

export const meta: Route.MetaFunction = () => [{ title: "Fill sources · Patina" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  const scope = requireArea(context, "routebook");
  const { url, params, active } = archivableListQuery(request, SOURCE_SORTS);
  const list = await listSources(scope, params, { kind: enumFilter(url, "kind", SOURCE_KINDS), active });
  return { ...list, params, mayEdit: roleMayOpen(scope.role, "routebookEdit") };
}

type Row = Route.ComponentProps["loaderData"]["rows"][number];

const columns: Array<Column<Row>> = [
  nameColumn("Source", (r) => `/sources/${r.id}`),
  { key: "kind", label: "Kind", sortKey: "kind", cell: (r) => labelOf(SOURCE_KIND_LABELS, r.kind) },
  { key: "pools", label: "Pools fed", sortKey: "pools", numeric: true, cell: (r) => r.poolCount },
  { key: "lastTest", label: "Last source test", sortKey: "lastTest", cell: (r) => r.lastTest ?? "never tested" },
  archiveColumn(),
];

export default function Sources({ loaderData }: Route.ComponentProps) {
  return (
    <ListPage title="Fill sources" intro="Where each pool's top-up water comes from" nouns={["source", "sources"]} add={{ to: "/sources/new", label: "Add a source" }}
      list={loaderData} columns={columns} searchLabel="Search source names" emptyText="No fill sources here yet.">
      <FilterSelect name="kind" label="Kind" allLabel="All kinds" options={options(SOURCE_KIND_LABELS)} />
      <ArchiveStatusFilter />
    </ListPage>
  );
}

export { ErrorPanel as ErrorBoundary } from "~/components/error-panel";
