import { Link } from "react-router";

/**
 * Earlier and later pages of a list whose page lives in the URL: plain links,
 * so paging works before the script arrives, and the scroll stays put.
 */
export function Pager({
  label,
  page,
  pages,
  href,
  earlier,
  later,
}: {
  /** Names the navigation for screen readers, e.g. "Water test pages". */
  label: string;
  page: number;
  pages: number;
  href: (page: number) => string;
  earlier: string;
  later: string;
}) {
  if (pages <= 1) return null;
  return (
    <nav aria-label={label} className="mt-2 flex items-center gap-4 text-sm">
      {page > 1 ? (
        <Link to={href(page - 1)} preventScrollReset className="font-medium text-verdigris-700 underline">
          {earlier}
        </Link>
      ) : null}
      <span className="text-muted">
        Page {page} of {pages}
      </span>
      {page < pages ? (
        <Link to={href(page + 1)} preventScrollReset className="font-medium text-verdigris-700 underline">
          {later}
        </Link>
      ) : null}
    </nav>
  );
}
