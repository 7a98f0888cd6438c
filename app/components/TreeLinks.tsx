// Small pieces shared by the tree pages: the lead's ways to add a tree, and the category choices.
import type { ReactNode } from "react";
import { Link } from "react-router";
import { CATEGORY_OPTIONS } from "./editor/kinds";

export function NewTreeLinks({ children }: { children?: ReactNode }) {
  return (
    <div className="flex flex-wrap gap-2">
      <Link to="/trees/new" className="btn-primary">
        New tree
      </Link>
      <Link to="/trees/import" className="btn-quiet">
        Import a tree file
      </Link>
      {children}
    </div>
  );
}

/** The equipment categories as <option>s, optionally led by an "all" choice. */
export function CategoryOptions({ all }: { all?: string }) {
  return (
    <>
      {all && <option value="">{all}</option>}
      {CATEGORY_OPTIONS.map((c) => (
        <option key={c.value} value={c.value}>
          {c.label}
        </option>
      ))}
    </>
  );
}
