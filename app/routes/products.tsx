import { requireArea } from "~/.server/guard";
import { listProducts, PRODUCT_SORTS } from "~/.server/routebook/queries/products";
import { companyPreferences } from "~/.server/settings/queries/company-settings";
import { type Column, FilterSelect } from "~/components/data-table";
import { options } from "~/components/form-controls";
import { archiveColumn, ArchiveStatusFilter, archivableListQuery, ListPage, nameColumn } from "~/components/routebook/list-table";
import { PRODUCT_CATEGORIES } from "~/lib/forms/routebook";
import { DOSE_BASIS_LABELS, labelOf, PRODUCT_CATEGORY_LABELS } from "~/lib/labels";
import { formatMoney } from "~/lib/format";
import { enumFilter } from "~/lib/list-params";
import { roleMayOpen } from "~/lib/roles";
import type { Route } from "./+types/products";

export const meta: Route.MetaFunction = () => [{ title: "Products · Patina" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  const scope = requireArea(context, "routebook");
  const { url, params, active } = archivableListQuery(request, PRODUCT_SORTS);
  const [list, prefs] = await Promise.all([
    listProducts(scope, params, { category: enumFilter(url, "category", PRODUCT_CATEGORIES), active }),
    companyPreferences(scope),
  ]);
  return { ...list, params, currency: prefs.currency, mayEdit: roleMayOpen(scope.role, "routebookEdit") };
}

type Row = Route.ComponentProps["loaderData"]["rows"][number];

export default function Products({ loaderData }: Route.ComponentProps) {
  const columns: Array<Column<Row>> = [
    nameColumn("Product", (r) => (loaderData.mayEdit ? `/products/${r.id}/edit` : null)),
    { key: "category", label: "Category", sortKey: "category", cell: (r) => labelOf(PRODUCT_CATEGORY_LABELS, r.category) },
    {
      key: "labelDose",
      label: "Label dose",
      sortKey: "labelDose",
      numeric: true,
      cell: (r) =>
        r.labelDose === null
          ? "—"
          : `${r.labelDose}${r.maintenanceDose === null ? "" : ` then ${r.maintenanceDose}`} ${r.doseUnit ?? ""} ${DOSE_BASIS_LABELS[r.doseBasis]}`,
    },
    {
      key: "unitCost",
      label: "Unit cost",
      sortKey: "unitCost",
      numeric: true,
      cell: (r) => (r.unitCost === null ? "—" : `${formatMoney(r.unitCost, loaderData.currency)} per ${r.doseUnit ?? "unit"}`),
    },
    archiveColumn(),
  ];
  return (
    <ListPage title="Products" nouns={["product", "products"]} add={{ to: "/products/new", label: "Add a product" }} list={loaderData} columns={columns}
      searchLabel="Search product names" emptyText="No products here yet.">
      <FilterSelect name="category" label="Category" allLabel="All categories" options={options(PRODUCT_CATEGORY_LABELS)} />
      <ArchiveStatusFilter />
    </ListPage>
  );
}

export { ErrorPanel as ErrorBoundary } from "~/components/error-panel";
