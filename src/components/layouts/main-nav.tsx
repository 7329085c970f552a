import { NavLink } from "react-router-dom";

export type NavItem = { to: string; label: string; end?: boolean };

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
            </NavLink>
          </li>
        ))}
      </ul>
    </nav>
  );
}
