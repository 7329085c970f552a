import { useState } from "react";
import { usersOnDuty } from "../../../../shared/domain/duty-rota.js";
import type { DutyRotaResponse, DutyShift } from "../../../../shared/schemas/alerts.js";
import { Button } from "../../../components/ui/button";
import { ConfirmDialog } from "../../../components/ui/dialog";
import { Table, TableBody, TableHead, Td, Th, Tr } from "../../../components/ui/table";
import { useToast } from "../../../components/ui/toast";
import { ALLOWED, useAuthorization } from "../../../lib/authorization";
import { useDeleteDutyShift } from "../api/delete-duty-shift";
import { useDutyRota } from "../api/get-duty-rota";
import { describeHours, describeWeekdays } from "../utils/describe-shift";
import { ShiftFormDialog, type RotaPerson } from "./shift-form-dialog";

type DutyRotaProps = {
  /** Who may be put on duty (admins see every active non-viewer); without it, the people already on the rota. */
  people?: readonly RotaPerson[];
  nowMs: number;
};

/** Everyone already on the rota, plus whoever is on duty now (the managers when nobody is). */
function peopleFromRota(rota: DutyRotaResponse): RotaPerson[] {
  const byId = new Map<number, string>();
  for (const s of rota.shifts) byId.set(s.userId, s.userName);
  for (const zone of rota.onDutyNow) for (const u of zone.users) byId.set(u.id, u.name);
  return [...byId].map(([id, name]) => ({ id, name })).sort((a, b) => a.name.localeCompare(b.name));
}

function sortShifts(shifts: readonly DutyShift[]): DutyShift[] {
  return [...shifts].sort(
    (a, b) =>
      Number(a.zoneId !== null) - Number(b.zoneId !== null) ||
      (a.zoneName ?? "").localeCompare(b.zoneName ?? "") ||
      Number(a.isFallback) - Number(b.isFallback) ||
      a.startMinute - b.startMinute ||
      a.userName.localeCompare(b.userName),
  );
}

type Editing = { kind: "add" } | { kind: "edit"; shift: DutyShift } | { kind: "delete"; shift: DutyShift } | null;

/**
 * The duty rota: who is told about each zone right now, then every shift. Admins and managers
 * add, edit and delete shifts; everyone else reads.
 */
export function DutyRota({ people, nowMs }: DutyRotaProps) {
  const { data: rota } = useDutyRota();
  const { isAllowed } = useAuthorization();
  const canEdit = isAllowed(ALLOWED.manageGrowing);
  const [editing, setEditing] = useState<Editing>(null);
  const remove = useDeleteDutyShift();
  const { showToast } = useToast();
  const choices = people ?? peopleFromRota(rota);
  const zones = rota.onDutyNow.map((z) => ({ id: z.zoneId, name: z.zoneName }));
  const shifts = sortShifts(rota.shifts);
  const deviceTimeZone = Intl.DateTimeFormat().resolvedOptions().timeZone;

  return (
    <div className="flex flex-col gap-8">
      <section aria-labelledby="on-duty-heading">
        <h2 id="on-duty-heading" className="mb-3 text-2xl font-bold">
          On duty now
        </h2>
        {rota.onDutyNow.length === 0 ? (
          <p className="text-lg text-muted">No zones are set up yet.</p>
        ) : (
          <ul className="grid gap-3 sm:grid-cols-2 lg:grid-cols-3">
            {rota.onDutyNow.map((zone) => {
              const isCovered = usersOnDuty(rota.shifts, zone.zoneId, nowMs, rota.timeZone).length > 0;
              return (
                <li key={zone.zoneId} className="rounded-xl border-2 border-line bg-surface p-4" data-zone-id={zone.zoneId}>
                  <p className="text-xl font-bold">{zone.zoneName}</p>
                  {zone.users.length === 0 ? (
                    <p className="mt-1 text-lg font-semibold text-high">Nobody would be told. Add a shift or a fallback.</p>
                  ) : (
                    <p className="mt-1 text-lg">{zone.users.map((u) => u.name).join(", ")}</p>
                  )}
                  {!isCovered && zone.users.length > 0 && (
                    <p className="mt-1 text-base text-muted">No shift covers this time, so the managers are told.</p>
                  )}
                </li>
              );
            })}
          </ul>
        )}
      </section>

      <section aria-labelledby="shifts-heading" className="flex flex-col gap-3">
        <div className="flex flex-wrap items-center justify-between gap-3">
          <h2 id="shifts-heading" className="text-2xl font-bold">
            Shifts
          </h2>
          {canEdit && (
            <Button variant="primary" onClick={() => setEditing({ kind: "add" })}>
              Add a shift
            </Button>
          )}
        </div>
        <p className="text-lg text-muted">
          Times are the site's local time ({rota.timeZone}){deviceTimeZone && deviceTimeZone !== rota.timeZone ? `; this device is set to ${deviceTimeZone}` : ""}.
          A fallback shift is told only when nobody else's shift covers the time.
          {!canEdit && " Only managers and admins change the rota."}
        </p>
        {shifts.length === 0 ? (
          <p className="rounded-xl border-2 border-line bg-surface p-4 text-lg">No shifts yet: the managers are told about every alert.</p>
        ) : (
          <Table caption="Duty shifts">
            <TableHead>
              <Th>Who</Th>
              <Th>Zone</Th>
              <Th>Days</Th>
              <Th>Hours</Th>
              <Th>Kind</Th>
              {canEdit && (
                <Th>
                  <span className="sr-only">Actions</span>
                </Th>
              )}
            </TableHead>
            <TableBody>
              {shifts.map((shift) => (
                <Tr key={shift.id} data-shift-id={shift.id}>
                  <Td label="Who">
                    <strong>{shift.userName}</strong>
                  </Td>
                  <Td label="Zone">{shift.zoneName ?? "Every zone"}</Td>
                  <Td label="Days">{describeWeekdays(shift.weekdays)}</Td>
                  <Td label="Hours">{describeHours(shift)}</Td>
                  <Td label="Kind">{shift.isFallback ? <span className="rounded-full border-2 border-accent px-2 font-semibold">Fallback</span> : "Regular"}</Td>
                  {canEdit && (
                    <Td label="" className="max-md:before:hidden">
                      <span className="flex flex-wrap gap-2 md:justify-end">
                        <Button onClick={() => setEditing({ kind: "edit", shift })}>
                          Edit<span className="sr-only"> shift of {shift.userName}</span>
                        </Button>
                        <Button variant="quiet" onClick={() => setEditing({ kind: "delete", shift })}>
                          Delete<span className="sr-only"> shift of {shift.userName}</span>
                        </Button>
                      </span>
                    </Td>
                  )}
                </Tr>
              ))}
            </TableBody>
          </Table>
        )}
      </section>

      {editing?.kind === "add" && (
        <ShiftFormDialog people={choices} peopleHint={people ? undefined : PEOPLE_HINT} zones={zones} timeZone={rota.timeZone} onClose={() => setEditing(null)} />
      )}
      {editing?.kind === "edit" && (
        <ShiftFormDialog
          shift={editing.shift}
          people={choices}
          peopleHint={people ? undefined : PEOPLE_HINT}
          zones={zones}
          timeZone={rota.timeZone}
          onClose={() => setEditing(null)}
        />
      )}
      {editing?.kind === "delete" && (
        <ConfirmDialog
          title="Delete this shift?"
          confirmLabel="Delete shift"
          confirmVariant="danger"
          isBusy={remove.isPending}
          onCancel={() => setEditing(null)}
          onConfirm={() =>
            remove.mutate(editing.shift.id, {
              onSuccess: () => {
                showToast("Shift deleted");
                setEditing(null);
              },
              onError: (error) => {
                showToast(`The shift was not deleted: ${error.message}`, "error");
                setEditing(null);
              },
            })
          }
        >
          {editing.shift.userName} will no longer be told about {editing.shift.zoneName ?? "every zone"} on this shift: {describeWeekdays(editing.shift.weekdays)},{" "}
          {describeHours(editing.shift)}.
        </ConfirmDialog>
      )}
    </div>
  );
}

const PEOPLE_HINT = "Listed: the people already on the rota and the managers. An admin can put someone new on it.";
