import { useCallback, useEffect, useRef, useState } from "react";
import { NavLink, useLocation } from "react-router-dom";

/** A count beside a link (open alerts); `label` is what a screen reader hears, e.g. "2 open". */
export type NavBadge = { count: number; label: string; isUrgent?: boolean };

export type NavItem = { to: string; label: string; end?: boolean; badge?: NavBadge };

/** Which edges of a sideways-scrolling row hide links (a phone does not show them all). */
type Hidden = { left: boolean; right: boolean };

const FADES: Record<string, string> = {
  "false,false": "",
  "false,true": "[mask-image:linear-gradient(to_right,black_80%,transparent)]",
  "true,false": "[mask-image:linear-gradient(to_left,black_80%,transparent)]",
  "true,true": "[mask-image:linear-gradient(to_right,transparent,black_20%,black_80%,transparent)]",
};

/**
 * The page links in the header; the current page is marked for sight and for screen readers.
 * On a narrow screen the row scrolls sideways: the edge that hides links fades out, as a cue,
 * and the current page's link is scrolled into view.
 */
export function MainNav({ items }: { items: readonly NavItem[] }) {
  const navRef = useRef<HTMLElement>(null);
  const [hidden, setHidden] = useState<Hidden>({ left: false, right: false });
  const { pathname } = useLocation();

  const measure = useCallback(() => {
    const nav = navRef.current;
    if (!nav) return;
    const left = nav.scrollLeft > 2;
    const right = nav.scrollLeft + nav.clientWidth < nav.scrollWidth - 2;
    setHidden((current) => (current.left === left && current.right === right ? current : { left, right }));
  }, []);

  useEffect(() => {
    navRef.current?.querySelector<HTMLElement>("[aria-current='page']")?.scrollIntoView?.({ block: "nearest", inline: "nearest" });
    measure();
  }, [pathname, measure]);

  useEffect(() => {
    window.addEventListener("resize", measure);
    return () => window.removeEventListener("resize", measure);
  }, [measure]);

  return (
    <nav ref={navRef} aria-label="Pages" onScroll={measure} className={`-mx-1 overflow-x-auto ${FADES[`${hidden.left},${hidden.right}`]}`}>
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
