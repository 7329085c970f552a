import { createContext, use, useCallback, useEffect, useMemo, useState, type ReactNode } from "react";
import type { TemperatureUnit } from "../../shared/domain/units.js";

/** localStorage key of the chosen scale; per browser until users get their own setting. */
export const TEMPERATURE_UNIT_STORAGE_KEY = "benchwarden.temperatureUnit";
export const DEFAULT_TEMPERATURE_UNIT: TemperatureUnit = "F";

function isTemperatureUnit(value: unknown): value is TemperatureUnit {
  return value === "C" || value === "F";
}

export function readStoredTemperatureUnit(): TemperatureUnit {
  try {
    const stored = window.localStorage.getItem(TEMPERATURE_UNIT_STORAGE_KEY);
    return isTemperatureUnit(stored) ? stored : DEFAULT_TEMPERATURE_UNIT;
  } catch {
    // Storage can be disabled (private mode, locked-down tablets): fall back to the default.
    return DEFAULT_TEMPERATURE_UNIT;
  }
}

type TemperatureUnitContextValue = {
  unit: TemperatureUnit;
  setUnit: (unit: TemperatureUnit) => void;
};

const TemperatureUnitContext = createContext<TemperatureUnitContextValue | null>(null);

export function TemperatureUnitProvider({ children }: { children: ReactNode }) {
  const [unit, setUnitState] = useState<TemperatureUnit>(readStoredTemperatureUnit);

  const setUnit = useCallback((next: TemperatureUnit) => {
    setUnitState(next);
    try {
      window.localStorage.setItem(TEMPERATURE_UNIT_STORAGE_KEY, next);
    } catch {
      // Not persisted; the choice still holds for this visit.
    }
  }, []);

  // Another tab changed the scale: follow it.
  useEffect(() => {
    const onStorage = (event: StorageEvent) => {
      if (event.key === TEMPERATURE_UNIT_STORAGE_KEY && isTemperatureUnit(event.newValue)) setUnitState(event.newValue);
    };
    window.addEventListener("storage", onStorage);
    return () => window.removeEventListener("storage", onStorage);
  }, []);

  const value = useMemo(() => ({ unit, setUnit }), [unit, setUnit]);
  return <TemperatureUnitContext value={value}>{children}</TemperatureUnitContext>;
}

export function useTemperatureUnit(): TemperatureUnitContextValue {
  const value = use(TemperatureUnitContext);
  if (!value) throw new Error("useTemperatureUnit must be used inside <TemperatureUnitProvider>");
  return value;
}
