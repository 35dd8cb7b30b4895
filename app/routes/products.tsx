import { requireArea } from "~/.server/guard";
import { listProducts, PRODUCT_SORTS } from "~/.server/routebook/queries/products";
import { ButtonLink, type Column, FilterSelect, ListFilters, PageHeader } from "~/components/data-table";
import { options } from "~/components/form-controls";
import { archiveColumn, ArchiveStatusFilter, countOf, ListTable, NameCell } from "~/components/routebook/list-table";
import { activeWanted, ARCHIVE_STATUSES } from "~/lib/archived";
import { PRODUCT_CATEGORIES } from "~/lib/forms/routebook";
import { DOSE_BASIS_LABELS, labelOf, PRODUCT_CATEGORY_LABELS } from "~/lib/labels";
import { enumFilter, listParams } from "~/lib/list-params";
import { roleMayOpen } from "~/lib/roles";
import type { Route } from "./+types/products";

export const meta: Route.MetaFunction = () => [{ title: "Products · Patina" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  const scope = requireArea(context, "routebook");
  const url = new URL(request.url);
  const params = listParams(url, PRODUCT_SORTS, "name");
  const status = enumFilter(url, "status", ARCHIVE_STATUSES) ?? "active";
  const list = await listProducts(scope, params, {
    category: enumFilter(url, "category", PRODUCT_CATEGORIES),
    active: activeWanted(status),
  });
  return { ...list, params, mayEdit: roleMayOpen(scope.role, "routebookEdit") };
}

type Row = Route.ComponentProps["loaderData"]["rows"][number];

export default function Products({ loaderData }: Route.ComponentProps) {
  const { rows, total, params, mayEdit } = loaderData;
  const columns: Array<Column<Row>> = [
    {
      key: "name",
      label: "Product",
      sortKey: "name",
      cell: (r) => <NameCell to={mayEdit ? `/products/${r.id}/edit` : null}>{r.name}</NameCell>,
    },
    { key: "category", label: "Category", sortKey: "category", cell: (r) => labelOf(PRODUCT_CATEGORY_LABELS, r.category) },
    {
      key: "labelDose",
      label: "Label dose",
      sortKey: "labelDose",
      numeric: true,
      cell: (r) => (r.labelDose === null ? "—" : `${r.labelDose} ${r.doseUnit ?? ""} ${DOSE_BASIS_LABELS[r.doseBasis]}`),
    },
    {
      key: "unitCost",
      label: "Unit cost",
      sortKey: "unitCost",
      numeric: true,
      cell: (r) => (r.unitCost === null ? "—" : `${r.unitCost.toFixed(2)} per ${r.doseUnit ?? "unit"}`),
    },
    archiveColumn(),
  ];
  return (
    <div>
      <PageHeader title="Products" action={mayEdit ? <ButtonLink to="/products/new">Add a product</ButtonLink> : null}>
        {countOf(total, "product", "products")}
      </PageHeader>
      <ListFilters searchLabel="Search product names">
        <FilterSelect name="category" label="Category" allLabel="All categories" options={options(PRODUCT_CATEGORY_LABELS)} />
        <ArchiveStatusFilter />
      </ListFilters>
      <ListTable caption="Products" columns={columns} rows={rows} total={total} params={params} noun="product" emptyText="No products here yet." />
    </div>
  );
}

export { ErrorPanel as ErrorBoundary } from "~/components/error-panel";
