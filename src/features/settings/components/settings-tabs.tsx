import { NavLink, useLocation } from "react-router-dom";
import { paths } from "../../../config/paths";

const TABS = [
  // Also current on a zone's or a bench's settings page, which are reached from it.
  { to: paths.settings.to(), label: "Sites, zones & benches", end: true, alsoUnder: ["/settings/zones/", "/settings/benches/"] },
  { to: paths.windowPresets.to(), label: "Window presets", end: false, alsoUnder: [] },
  { to: paths.audit.to(), label: "Change log", end: false, alsoUnder: [] },
] as const satisfies readonly { to: string; label: string; end: boolean; alsoUnder: readonly string[] }[];

/** The settings area's own links, under its heading; large targets, the current one marked. */
export function SettingsTabs() {
  const { pathname } = useLocation();
  return (
    <nav aria-label="Settings" className="-mx-1 overflow-x-auto">
      <ul className="flex gap-2 px-1">
        {TABS.map((tab) => (
          <li key={tab.to}>
            <NavLink
              to={tab.to}
              end={tab.end}
              className={({ isActive }) =>
                `inline-flex min-h-touch items-center whitespace-nowrap rounded-lg border-2 px-3 text-lg font-semibold ${
                  isActive || tab.alsoUnder.some((prefix: string) => pathname.startsWith(prefix))
                    ? "border-accent bg-surface text-ink"
                    : "border-line text-muted hover:text-ink"
                }`
              }
            >
              {tab.label}
            </NavLink>
          </li>
        ))}
      </ul>
    </nav>
  );
}
