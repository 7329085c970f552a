import { useState } from "react";
import { Button } from "../../../components/ui/button";
import { ConfirmDialog } from "../../../components/ui/dialog";
import { useToast } from "../../../components/ui/toast";
import { useArchiveBench } from "../api/archive-bench";
import { useArchiveSite } from "../api/archive-site";
import { useArchiveZone } from "../api/archive-zone";
import { useRestoreBench } from "../api/restore-bench";
import { useRestoreSite } from "../api/restore-site";
import { useRestoreZone } from "../api/restore-zone";

type Kind = "site" | "zone" | "bench";

const CONSEQUENCE: Record<Kind, string> = {
  site: "Its zones and benches are archived with it. Nothing is deleted: readings, windows and the audit trail are kept, and you can restore it.",
  zone: "Its benches are archived with it. Nothing is deleted: readings, windows and the audit trail are kept, and you can restore it.",
  bench: "It leaves the dashboard and the walk-through. Nothing is deleted: its readings, windows and audit trail are kept, and you can restore it. Move its sensors off first.",
};

function useArchiveMutations(kind: Kind) {
  const site = [useArchiveSite(), useRestoreSite()] as const;
  const zone = [useArchiveZone(), useRestoreZone()] as const;
  const bench = [useArchiveBench(), useRestoreBench()] as const;
  return { site, zone, bench }[kind];
}

/** Archive (after a confirmation that says what happens) or restore a site, zone or bench. */
export function ArchiveButton({ kind, id, name, isArchived }: { kind: Kind; id: number; name: string; isArchived: boolean }) {
  const [archive, restore] = useArchiveMutations(kind);
  const [isConfirming, setIsConfirming] = useState(false);
  const { showToast } = useToast();
  // mutateAsync: archiving or restoring moves the item to another list, which unmounts this
  // button, and TanStack drops mutate's callbacks then; the toast must still be shown.
  async function run(mutation: typeof archive, done: string) {
    try {
      await mutation.mutateAsync(id);
      showToast(`${name} ${done}`);
    } catch (e) {
      showToast(`${name}: ${e instanceof Error ? e.message : "not changed"}`, "error");
    } finally {
      setIsConfirming(false);
    }
  }

  if (isArchived) {
    return (
      <Button isBusy={restore.isPending} onClick={() => void run(restore, "restored")}>
        Restore {name}
      </Button>
    );
  }
  return (
    <>
      <Button onClick={() => setIsConfirming(true)}>Archive {name}</Button>
      {isConfirming && (
        <ConfirmDialog
          title={`Archive ${name}?`}
          confirmLabel={`Archive ${kind}`}
          isBusy={archive.isPending}
          onCancel={() => setIsConfirming(false)}
          onConfirm={() => void run(archive, "archived")}
        >
          {CONSEQUENCE[kind]}
        </ConfirmDialog>
      )}
    </>
  );
}
