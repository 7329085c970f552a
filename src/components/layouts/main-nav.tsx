import { NavLink } from "react-router-dom";

/** A count beside a link (open alerts); `label` is what a screen reader hears, e.g. "2 open". */
export type NavBadge = { count: number; label: string; isUrgent?: boolean };

export type NavItem = { to: string; label: string; end?: boolean; badge?: NavBadge };

/** The page links in the header; the current page is marked for sight and for screen readers. */
export function MainNav({ items }: { items: readonly NavItem[] }) {
  return (
    <nav aria-label="Pages" className="-mx-1 overflow-x-auto">
      <ul className="flex gap-1 px-1">
        {items.map((item) => (
          <li key={item.to}>
            <NavLink
              to={item.to}
              end={item.end}
              className={({ isActive }) =>
                `inline-flex min-h-touch items-center whitespace-nowrap rounded-lg border-2 px-3 text-lg font-semibold ${
                  isActive ? "border-ink bg-ink text-page" : "border-transparent text-ink hover:border-line"
                }`
              }
            >
              {item.label}
              {item.badge && item.badge.count > 0 && (
                <span
                  data-badge={item.badge.isUrgent ? "urgent" : "calm"}
                  className={`ml-2 inline-flex min-w-7 items-center justify-center rounded-full border-2 px-1.5 text-base font-bold leading-6 tabular-nums ${
                    item.badge.isUrgent ? "border-high bg-high text-on-status" : "border-current bg-transparent"
                  }`}
                >
                  <span aria-hidden="true">{item.badge.count}</span>
                  <span className="sr-only">, {item.badge.label}</span>
                </span>
              )}
            </NavLink>
          </li>
        ))}
      </ul>
    </nav>
  );
}
