import { Link } from "react-router";

/** Previous / next links for a paged list; nothing when it fits on one page. */
export function Pager({
  page,
  pages,
  href,
  className = "mt-6",
}: {
  page: number;
  pages: number;
  href: (page: number) => string;
  className?: string;
}) {
  if (pages <= 1) return null;
  return (
    <nav aria-label="Pages" className={`${className} flex items-center gap-2 text-sm`}>
      {page > 1 ? (
        <Link to={href(page - 1)} className="inline-flex min-h-11 items-center rounded-md border border-rule px-3">
          Previous
        </Link>
      ) : null}
      <span className="text-ink-soft">{`Page ${page} of ${pages}`}</span>
      {page < pages ? (
        <Link to={href(page + 1)} className="inline-flex min-h-11 items-center rounded-md border border-rule px-3">
          Next
        </Link>
      ) : null}
    </nav>
  );
}
