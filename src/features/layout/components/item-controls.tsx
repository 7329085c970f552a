import { useState } from "react";
import { Button } from "../../../components/ui/button";
import { ALLOWED, useAuthorization } from "../../../lib/authorization";
import { useLayout } from "../api/get-layout";
import { ArchiveButton } from "./archive-button";
import { BenchDialog, ZoneDialog } from "./layout-dialogs";
import { LAYOUT_EDITORS } from "./layout-overview";

/** On a zone's page: rename, archive or restore it (admin); nothing for other roles. */
export function ZoneControls({ zoneId }: { zoneId: number }) {
  const { data } = useLayout({ includeArchived: true });
  const { isAllowed } = useAuthorization();
  const [isRenaming, setIsRenaming] = useState(false);
  const zone = data.zones.find((z) => z.id === zoneId);
  const site = data.sites.find((s) => s.id === zone?.siteId);
  if (!zone || !isAllowed(LAYOUT_EDITORS)) return null;
  const isArchived = zone.archivedAtMs !== null;
  return (
    <div className="flex flex-wrap gap-2">
      {!isArchived && <Button onClick={() => setIsRenaming(true)}>Rename zone</Button>}
      {site?.archivedAtMs === null && <ArchiveButton kind="zone" id={zone.id} name={zone.name} isArchived={isArchived} />}
      {isRenaming && <ZoneDialog zone={zone} onClose={() => setIsRenaming(false)} />}
    </div>
  );
}

/** On a bench's page: rename, move to another zone, archive or restore it (admin, manager). */
export function BenchControls({ benchId }: { benchId: number }) {
  const { data } = useLayout({ includeArchived: true });
  const { isAllowed } = useAuthorization();
  const [isEditing, setIsEditing] = useState(false);
  const bench = data.benches.find((b) => b.id === benchId);
  if (!bench || !isAllowed(ALLOWED.manageGrowing)) return null;
  const zone = data.zones.find((z) => z.id === bench.zoneId);
  const isArchived = bench.archivedAtMs !== null;
  const liveZones = data.zones.filter((z) => z.archivedAtMs === null).map((z) => ({ id: z.id, name: z.name }));
  return (
    <div className="flex flex-wrap gap-2">
      {!isArchived && <Button onClick={() => setIsEditing(true)}>Rename or move bench</Button>}
      {zone?.archivedAtMs === null && <ArchiveButton kind="bench" id={bench.id} name={bench.name} isArchived={isArchived} />}
      {isEditing && <BenchDialog bench={bench} zoneChoices={liveZones} onClose={() => setIsEditing(false)} />}
    </div>
  );
}
