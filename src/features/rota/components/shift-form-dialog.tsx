import { useRef, useState, type FormEvent } from "react";
import { dutyShiftInputSchema, type DutyShift, type DutyShiftInput } from "../../../../shared/schemas/alerts.js";
import { EVERY_DAY } from "../../../../shared/domain/duty-rota.js";
import { Button } from "../../../components/ui/button";
import { Dialog } from "../../../components/ui/dialog";
import { SelectField, TextField } from "../../../components/ui/form";
import { Notice } from "../../../components/ui/notice";
import { useToast } from "../../../components/ui/toast";
import { errorsFromApi, errorsFromZod, focusFirstInvalid, type FormErrors } from "../../../lib/form";
import { useCreateDutyShift } from "../api/create-duty-shift";
import { useUpdateDutyShift } from "../api/update-duty-shift";
import { DAY_MINUTES, WEEK, WEEKDAYS_MASK, WEEKEND_MASK, hasDay, isAllDay, minuteFromTimeInput, timeInputFromMinute } from "../utils/describe-shift";

const FIELDS = ["userId", "zoneId", "weekdays", "startMinute", "endMinute", "isFallback"] as const;
const NO_ERRORS: FormErrors = { fields: {}, form: null };
const EVERY_ZONE = "all";

export type RotaPerson = { id: number; name: string };
export type RotaZone = { id: number; name: string };

export type ShiftFormValues = { userId: string; zoneId: string; weekdays: number; isAllDay: boolean; start: string; end: string; isFallback: boolean };

function initialValues(shift: DutyShift | undefined): ShiftFormValues {
  if (!shift) return { userId: "", zoneId: EVERY_ZONE, weekdays: EVERY_DAY, isAllDay: false, start: "18:00", end: "07:00", isFallback: false };
  return {
    userId: String(shift.userId),
    zoneId: shift.zoneId === null ? EVERY_ZONE : String(shift.zoneId),
    weekdays: shift.weekdays,
    isAllDay: isAllDay(shift),
    start: timeInputFromMinute(shift.startMinute),
    end: timeInputFromMinute(shift.endMinute),
    isFallback: shift.isFallback,
  };
}

/**
 * The form's values checked with the shared dutyShiftInputSchema (the one the server runs), with
 * plain words where a field was simply left empty (the schema would say "expected number").
 */
export function validateShift(values: ShiftFormValues): { input: DutyShiftInput | null; errors: FormErrors } {
  const candidate = {
    userId: values.userId === "" ? undefined : Number(values.userId),
    zoneId: values.zoneId === EVERY_ZONE ? null : Number(values.zoneId),
    weekdays: values.weekdays,
    startMinute: values.isAllDay ? 0 : minuteFromTimeInput(values.start),
    endMinute: values.isAllDay ? DAY_MINUTES : minuteFromTimeInput(values.end),
    isFallback: values.isFallback,
  };
  const parsed = dutyShiftInputSchema.safeParse(candidate);
  if (parsed.success) return { input: parsed.data, errors: NO_ERRORS };
  const errors = errorsFromZod(parsed.error, FIELDS);
  if (candidate.userId === undefined) errors.fields.userId = "Choose who is on duty";
  if (candidate.startMinute === undefined) errors.fields.startMinute = "Enter the time the shift starts";
  if (candidate.endMinute === undefined) errors.fields.endMinute = "Enter the time the shift ends";
  return { input: null, errors };
}

type ShiftFormDialogProps = {
  /** The shift to edit; none to add one. */
  shift?: DutyShift;
  people: readonly RotaPerson[];
  /** Why the list of people may be short (a manager sees only those already on the rota). */
  peopleHint?: string;
  zones: readonly RotaZone[];
  timeZone: string;
  onClose: () => void;
};

/** Adds or edits one duty shift: who, which zone, which days, which hours, and whether it is the fallback. */
export function ShiftFormDialog({ shift, people, peopleHint, zones, timeZone, onClose }: ShiftFormDialogProps) {
  const formRef = useRef<HTMLFormElement>(null);
  const [values, setValues] = useState<ShiftFormValues>(() => initialValues(shift));
  const [errors, setErrors] = useState<FormErrors>(NO_ERRORS);
  const create = useCreateDutyShift();
  const update = useUpdateDutyShift();
  const { showToast } = useToast();
  const isBusy = create.isPending || update.isPending;
  // A person no longer listed (disabled since) still shows as the shift's current choice.
  const choices = shift && !people.some((p) => p.id === shift.userId) ? [...people, { id: shift.userId, name: shift.userName }] : people;

  function change(patch: Partial<ShiftFormValues>, ...fields: string[]) {
    setValues((current) => ({ ...current, ...patch }));
    setErrors((current) => {
      const rest = { ...current.fields };
      for (const f of fields) delete rest[f];
      return { fields: rest, form: current.form };
    });
  }

  function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const result = validateShift(values);
    setErrors(result.errors);
    if (!result.input) {
      focusFirstInvalid(formRef.current);
      return;
    }
    const onError = (error: unknown) => {
      setErrors(errorsFromApi(error, { fields: FIELDS }));
      focusFirstInvalid(formRef.current);
    };
    const onSuccess = () => {
      showToast(shift ? "Shift saved" : "Shift added");
      onClose();
    };
    if (shift) update.mutate({ shiftId: shift.id, input: result.input }, { onSuccess, onError });
    else create.mutate(result.input, { onSuccess, onError });
  }

  return (
    <Dialog title={shift ? "Edit shift" : "Add a shift"} onClose={onClose} className="max-w-xl">
      <form ref={formRef} onSubmit={onSubmit} noValidate aria-label={shift ? "Edit shift" : "Add a shift"} className="flex flex-col gap-4">
        {errors.form && <Notice tone="error">{errors.form}</Notice>}
        <SelectField
          label="Who"
          name="userId"
          hint={peopleHint}
          value={values.userId}
          onChange={(e) => change({ userId: e.target.value }, "userId")}
          error={errors.fields.userId}
        >
          <option value="">Choose a person…</option>
          {choices.map((person) => (
            <option key={person.id} value={person.id}>
              {person.name}
            </option>
          ))}
        </SelectField>
        <SelectField label="Zone" name="zoneId" value={values.zoneId} onChange={(e) => change({ zoneId: e.target.value }, "zoneId")} error={errors.fields.zoneId}>
          <option value={EVERY_ZONE}>Every zone</option>
          {zones.map((zone) => (
            <option key={zone.id} value={zone.id}>
              {zone.name}
            </option>
          ))}
        </SelectField>
        <WeekdayPicker value={values.weekdays} onChange={(weekdays) => change({ weekdays }, "weekdays")} error={errors.fields.weekdays} />
        <fieldset className="flex flex-col gap-2">
          <legend className="mb-1 text-lg font-semibold">Hours</legend>
          <p className="text-base text-muted">In the site's time ({timeZone}). An end before the start runs past midnight into the next day.</p>
          <CheckRow
            label="All day"
            checked={values.isAllDay}
            onChange={(isAllDayValue) => change({ isAllDay: isAllDayValue }, "startMinute", "endMinute")}
          />
          {!values.isAllDay && (
            <div className="grid grid-cols-2 gap-3">
              <TextField
                label="From"
                name="startMinute"
                type="time"
                value={values.start}
                onChange={(e) => change({ start: e.target.value }, "startMinute", "endMinute")}
                error={errors.fields.startMinute}
              />
              <TextField
                label="To"
                name="endMinute"
                type="time"
                value={values.end}
                onChange={(e) => change({ end: e.target.value }, "startMinute", "endMinute")}
                error={errors.fields.endMinute}
              />
            </div>
          )}
        </fieldset>
        <CheckRow
          label="Fallback"
          description="Told only when nobody else's shift covers the time, on the days ticked."
          checked={values.isFallback}
          onChange={(isFallback) => change({ isFallback }, "isFallback", "endMinute")}
        />
        <div className="flex flex-wrap justify-end gap-3">
          <Button onClick={onClose}>Cancel</Button>
          <Button type="submit" variant="primary" isBusy={isBusy}>
            {shift ? "Save shift" : "Add shift"}
          </Button>
        </div>
      </form>
    </Dialog>
  );
}

function CheckRow({ label, description, checked, onChange }: { label: string; description?: string; checked: boolean; onChange: (checked: boolean) => void }) {
  return (
    <label className="flex min-h-touch cursor-pointer items-start gap-3 rounded-lg border-2 border-line bg-surface p-3 has-[:checked]:border-accent">
      <input type="checkbox" checked={checked} onChange={(e) => onChange(e.target.checked)} className="mt-1 size-5 shrink-0 accent-[var(--bw-accent)]" />
      <span>
        <span className="block text-lg font-semibold">{label}</span>
        {description && <span className="block text-base text-muted">{description}</span>}
      </span>
    </label>
  );
}

function WeekdayPicker({ value, onChange, error }: { value: number; onChange: (weekdays: number) => void; error?: string }) {
  const errorId = "shift-weekdays-error";
  return (
    <fieldset className="flex flex-col gap-2" aria-describedby={error ? errorId : undefined}>
      <legend className="mb-1 text-lg font-semibold">Days</legend>
      <div className="flex flex-wrap gap-2">
        {WEEK.map((day) => {
          const isOn = hasDay(value, day.bit);
          return (
            <label
              key={day.bit}
              className="flex min-h-touch min-w-touch cursor-pointer items-center justify-center rounded-lg border-2 border-line bg-surface px-3 text-lg font-bold has-[:checked]:border-ink has-[:checked]:bg-ink has-[:checked]:text-page has-[:focus-visible]:ring-4 has-[:focus-visible]:ring-accent"
            >
              <input
                type="checkbox"
                name="weekdays"
                className="sr-only"
                checked={isOn}
                aria-invalid={error ? true : undefined}
                onChange={() => onChange(value ^ (1 << day.bit))}
              />
              <span aria-hidden="true">{day.short}</span>
              <span className="sr-only">{day.long}</span>
            </label>
          );
        })}
      </div>
      <div className="flex flex-wrap gap-2">
        <Button variant="quiet" onClick={() => onChange(EVERY_DAY)}>
          Every day
        </Button>
        <Button variant="quiet" onClick={() => onChange(WEEKDAYS_MASK)}>
          Mon–Fri
        </Button>
        <Button variant="quiet" onClick={() => onChange(WEEKEND_MASK)}>
          Weekend
        </Button>
      </div>
      {error && (
        <p id={errorId} className="text-base font-semibold text-high">
          {error}
        </p>
      )}
    </fieldset>
  );
}
