import { Suspense, useId, useState } from "react";
import { Link } from "react-router-dom";
import type { Role } from "../../../../shared/schemas/auth.js";
import type { SiteView, ZoneView } from "../../../../shared/schemas/layout.js";
import { Button } from "../../../components/ui/button";
import { Loading } from "../../../components/ui/loading";
import { paths } from "../../../config/paths";
import { useAuthorization } from "../../../lib/authorization";
import { useLayout } from "../api/get-layout";
import { ArchiveButton } from "./archive-button";
import { SiteDialog, ZoneDialog } from "./layout-dialogs";

/** Sites and zones are set up by the admin (server/modules/layout: ADMIN_ONLY). */
export const LAYOUT_EDITORS: readonly Role[] = ["admin"];

type LayoutOverviewProps = { presetChoices: readonly { id: string; name: string }[] };

type DialogState = { kind: "site"; site?: SiteView } | { kind: "zone"; zone?: ZoneView; siteId?: number } | null;

/**
 * The nursery's sites and their zones, each zone linking to its own page (windows, benches,
 * audit). Admins add, rename, archive and restore sites and zones; archived ones are shown on request.
 */
export function LayoutOverview({ presetChoices }: LayoutOverviewProps) {
  const [showArchived, setShowArchived] = useState(false);
  const checkboxId = useId();
  return (
    <div className="flex flex-col gap-4">
      <label htmlFor={checkboxId} className="flex min-h-touch cursor-pointer items-center gap-3 self-start text-lg">
        <input id={checkboxId} type="checkbox" checked={showArchived} onChange={(e) => setShowArchived(e.target.checked)} className="size-6 accent-[var(--bw-accent)]" />
        Show archived sites, zones and benches
      </label>
      <Suspense fallback={<Loading label="Loading the layout…" />}>
        <LayoutTree includeArchived={showArchived} presetChoices={presetChoices} />
      </Suspense>
    </div>
  );
}

function LayoutTree({ includeArchived, presetChoices }: { includeArchived: boolean } & LayoutOverviewProps) {
  const { data } = useLayout({ includeArchived });
  const { isAllowed } = useAuthorization();
  const canEdit = isAllowed(LAYOUT_EDITORS);
  const [dialog, setDialog] = useState<DialogState>(null);

  return (
    <div className="flex flex-col gap-6">
      {data.sites.map((site) => {
        const zones = data.zones.filter((z) => z.siteId === site.id);
        const isArchived = site.archivedAtMs !== null;
        return (
          <section key={site.id} aria-labelledby={`site-${site.id}`} data-site-id={site.id} className="flex flex-col gap-3">
            <div className="flex flex-wrap items-baseline gap-x-3 gap-y-2 border-b-2 border-line pb-2">
              <h3 id={`site-${site.id}`} className="text-2xl font-bold">
                {site.name}
              </h3>
              <span className="text-lg text-muted">{site.timeZone}</span>
              {isArchived && <span className="rounded-full bg-none-soft px-3 font-semibold text-muted">Archived</span>}
              {canEdit && (
                <div className="ml-auto flex flex-wrap gap-2">
                  {!isArchived && <Button onClick={() => setDialog({ kind: "site", site })}>Edit {site.name}</Button>}
                  <ArchiveButton kind="site" id={site.id} name={site.name} isArchived={isArchived} />
                </div>
              )}
            </div>
            {zones.length === 0 && <p className="text-lg text-muted">No zones on this site yet.</p>}
            <ul className="grid gap-3 md:grid-cols-2">
              {zones.map((zone) => {
                const benches = data.benches.filter((b) => b.zoneId === zone.id && b.archivedAtMs === null);
                const own = benches.filter((b) => b.hasWindowOverrides).length;
                const isZoneArchived = zone.archivedAtMs !== null;
                return (
                  <li key={zone.id} data-zone-id={zone.id} className={`flex flex-col gap-2 rounded-xl border-2 bg-surface p-3 ${isZoneArchived ? "border-dashed border-line" : "border-line"}`}>
                    <Link to={paths.settingsZone.to(zone.id)} className="text-xl font-bold text-accent underline underline-offset-4">
                      {zone.name}
                    </Link>
                    <p className="text-base text-muted">
                      {benches.length === 1 ? "1 bench" : `${benches.length} benches`}
                      {own > 0 && `, ${own} with windows of their own`}
                      {isZoneArchived && " · Archived"}
                    </p>
                    {canEdit && !isArchived && (
                      <div className="flex flex-wrap gap-2">
                        {!isZoneArchived && <Button onClick={() => setDialog({ kind: "zone", zone })}>Rename {zone.name}</Button>}
                        <ArchiveButton kind="zone" id={zone.id} name={zone.name} isArchived={isZoneArchived} />
                      </div>
                    )}
                  </li>
                );
              })}
            </ul>
            {canEdit && !isArchived && (
              <Button className="self-start" onClick={() => setDialog({ kind: "zone", siteId: site.id })}>
                Add a zone to {site.name}
              </Button>
            )}
          </section>
        );
      })}
      {canEdit && (
        <Button variant="primary" className="self-start" onClick={() => setDialog({ kind: "site" })}>
          Add a site
        </Button>
      )}
      {dialog?.kind === "site" && <SiteDialog site={dialog.site} onClose={() => setDialog(null)} />}
      {dialog?.kind === "zone" && <ZoneDialog zone={dialog.zone} siteId={dialog.siteId} presetChoices={presetChoices} onClose={() => setDialog(null)} />}
    </div>
  );
}
