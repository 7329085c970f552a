import { useState } from "react";
import { Link } from "react-router-dom";
import type { BenchView } from "../../../../shared/schemas/layout.js";
import { Button } from "../../../components/ui/button";
import { useToast } from "../../../components/ui/toast";
import { paths } from "../../../config/paths";
import { ALLOWED, useAuthorization } from "../../../lib/authorization";
import { useLayout } from "../api/get-layout";
import { useReorderBenches } from "../api/reorder-benches";
import { ArchiveButton } from "./archive-button";
import { BenchDialog } from "./layout-dialogs";

/** Moves the bench at `index` one place up (−1) or down (+1) in a list of ids. */
export function moveInOrder(ids: readonly number[], index: number, step: -1 | 1): number[] {
  const target = index + step;
  if (target < 0 || target >= ids.length) return [...ids];
  const next = [...ids];
  [next[index], next[target]] = [next[target]!, next[index]!];
  return next;
}

/**
 * A zone's benches in walking order (the order of the morning round). Managers and admins move
 * a bench up or down with large buttons, rename it, move it to another zone, archive or restore it.
 */
export function BenchOrderList({ zoneId }: { zoneId: number }) {
  const { data } = useLayout({ includeArchived: true });
  const { isAllowed } = useAuthorization();
  const canEdit = isAllowed(ALLOWED.manageGrowing);
  const reorder = useReorderBenches();
  const { showToast } = useToast();
  const [dialog, setDialog] = useState<{ bench?: BenchView } | null>(null);
  const zone = data.zones.find((z) => z.id === zoneId);
  const benches = data.benches.filter((b) => b.zoneId === zoneId);
  const live = benches.filter((b) => b.archivedAtMs === null).sort((a, b) => a.position - b.position || a.id - b.id);
  const archived = benches.filter((b) => b.archivedAtMs !== null);
  const liveZones = data.zones.filter((z) => z.archivedAtMs === null).map((z) => ({ id: z.id, name: z.name }));
  const isZoneLive = zone?.archivedAtMs === null;

  function move(index: number, step: -1 | 1) {
    const bench = live[index]!;
    reorder.mutate(
      { zoneId, input: { benchIds: moveInOrder(live.map((b) => b.id), index, step) } },
      {
        onSuccess: () => showToast(`${bench.name} moved ${step < 0 ? "up" : "down"}`),
        onError: (e) => showToast(`The order was not saved: ${e.message}`, "error"),
      },
    );
  }

  return (
    <div className="flex flex-col gap-4">
      {live.length === 0 ? (
        <p className="text-lg text-muted">No benches in use in this zone.</p>
      ) : (
        <ol aria-label="Benches in walking order" className="flex flex-col gap-2">
          {live.map((bench, index) => (
            <li key={bench.id} data-bench-id={bench.id} className="flex flex-wrap items-center gap-3 rounded-xl border-2 border-line bg-surface p-3">
              <span className="flex size-11 shrink-0 items-center justify-center rounded-full bg-none-soft text-xl font-bold" aria-hidden="true">
                {index + 1}
              </span>
              <div className="min-w-40 flex-1">
                <Link to={paths.settingsBench.to(bench.id)} className="text-xl font-bold text-accent underline underline-offset-4">
                  {bench.name}
                </Link>
                <p className="text-base text-muted">
                  {bench.sensors.length === 0 ? "No sensors" : bench.sensors.map((s) => s.id).join(", ")}
                  {bench.hasWindowOverrides && (
                    <span className="ml-2 rounded bg-accent px-1.5 font-semibold text-page" data-own-windows>
                      Own windows
                    </span>
                  )}
                </p>
              </div>
              {canEdit && isZoneLive && (
                <div className="flex flex-wrap gap-2">
                  <Button aria-label={`Move ${bench.name} up`} disabled={index === 0 || reorder.isPending} onClick={() => move(index, -1)} className="min-w-14 text-2xl">
                    <span aria-hidden="true">↑</span>
                  </Button>
                  <Button aria-label={`Move ${bench.name} down`} disabled={index === live.length - 1 || reorder.isPending} onClick={() => move(index, 1)} className="min-w-14 text-2xl">
                    <span aria-hidden="true">↓</span>
                  </Button>
                  <Button onClick={() => setDialog({ bench })}>Edit {bench.name}</Button>
                  <ArchiveButton kind="bench" id={bench.id} name={bench.name} isArchived={false} />
                </div>
              )}
            </li>
          ))}
        </ol>
      )}
      {canEdit && isZoneLive && (
        <Button variant="primary" className="self-start" onClick={() => setDialog({})}>
          Add a bench
        </Button>
      )}
      {archived.length > 0 && (
        <section aria-labelledby="archived-benches-heading" className="flex flex-col gap-2">
          <h3 id="archived-benches-heading" className="text-lg font-bold">
            Archived benches
          </h3>
          <ul className="flex flex-col gap-2">
            {archived.map((bench) => (
              <li key={bench.id} className="flex flex-wrap items-center gap-3 rounded-xl border-2 border-dashed border-line p-3">
                <Link to={paths.settingsBench.to(bench.id)} className="flex-1 text-lg font-semibold text-muted underline underline-offset-4">
                  {bench.name}
                </Link>
                {canEdit && isZoneLive && <ArchiveButton kind="bench" id={bench.id} name={bench.name} isArchived />}
              </li>
            ))}
          </ul>
        </section>
      )}
      {dialog && <BenchDialog bench={dialog.bench} zoneId={zoneId} zoneChoices={liveZones} onClose={() => setDialog(null)} />}
    </div>
  );
}
