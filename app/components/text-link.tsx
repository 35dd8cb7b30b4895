import type { ReactNode } from "react";
import { Link } from "react-router";

/** A link in text, a list or a table: the app's link colour, underlined. */
export function TextLink({ to, children }: { to: string; children: ReactNode }) {
  return (
    <Link to={to} className="font-medium text-verdigris-700 underline">
      {children}
    </Link>
  );
}
