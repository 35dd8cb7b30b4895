import type { ReactNode } from "react";
import { Form, useSearchParams } from "react-router";
import { METALS } from "@analysis/metals/reading";
import { METAL_LABELS } from "@analysis/metals/names";
import { OptionList } from "~/components/form-controls";

const fieldClass = "mt-1 block w-full rounded-lg border border-line bg-white px-3 py-2 text-base";
const METAL_OPTIONS = METALS.map((m) => ({ value: m, label: METAL_LABELS[m] }));

/**
 * Date window (and metal) of an analytics page, kept in the URL so a view
 * can be bookmarked. With scripts on, the page's queries refetch from the API;
 * without them, the form reloads the page through its loader.
 */
export function FilterBar({ metal = false, anyMetal = true, children }: { metal?: boolean; anyMetal?: boolean; children?: ReactNode }) {
  const [search, setSearch] = useSearchParams();
  return (
    <Form
      method="get"
      className="grid grid-cols-2 gap-3 rounded-xl border border-line bg-white p-4 sm:flex sm:flex-wrap sm:items-end"
      onSubmit={(event) => {
        event.preventDefault();
        const next = new URLSearchParams(search);
        for (const [key, value] of new FormData(event.currentTarget)) {
          if (typeof value === "string" && value !== "") next.set(key, value);
          else next.delete(key);
        }
        setSearch(next, { replace: true, preventScrollReset: true });
      }}
    >
      <label className="text-sm font-medium">
        From
        <input type="date" name="from" defaultValue={search.get("from") ?? ""} className={fieldClass} />
      </label>
      <label className="text-sm font-medium">
        To
        <input type="date" name="to" defaultValue={search.get("to") ?? ""} className={fieldClass} />
      </label>
      {metal ? <FilterBarSelect name="metal" label="Metal" options={METAL_OPTIONS} blank={anyMetal ? "All metals" : undefined} /> : null}
      {children}
      <button type="submit" className="col-span-2 rounded-lg bg-verdigris-700 px-4 py-2 font-medium text-white sm:col-span-1">
        Show
      </button>
    </Form>
  );
}

/** A select of the filter bar, kept in the URL like the dates; `fallback` is chosen while the URL names none. */
export function FilterBarSelect({
  name,
  label,
  options,
  blank,
  fallback = "",
}: {
  name: string;
  label: string;
  options: ReadonlyArray<{ value: string; label: string }>;
  blank?: string;
  fallback?: string;
}) {
  const [search] = useSearchParams();
  return (
    <label className="text-sm font-medium">
      {label}
      <select name={name} defaultValue={search.get(name) ?? fallback} className={fieldClass}>
        <OptionList options={options} blank={blank} />
      </select>
    </label>
  );
}

/** The page's own search parameters as a plain object, for hooks and query keys. */
export function useSearchObject(names: readonly string[]): Record<string, string | undefined> {
  const [search] = useSearchParams();
  return Object.fromEntries(names.map((n) => [n, search.get(n) ?? undefined]));
}

export function QueryState({ isFetching, error }: { isFetching: boolean; error: Error | null }) {
  if (error) return <p role="alert" className="rounded-lg border border-alert/40 bg-white p-3 text-sm text-alert">{error.message}</p>;
  return isFetching ? <p className="text-sm text-muted" aria-live="polite">Updating the figures…</p> : null;
}
