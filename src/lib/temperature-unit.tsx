import { createContext, use, useCallback, useEffect, useMemo, useState, type ReactNode } from "react";
import type { TemperatureUnit } from "../../shared/domain/units.js";

/**
 * localStorage key of the last scale used on this browser. It is the default before anyone signs
 * in; once signed in, the user's own preference (saved on the server) wins and is copied here.
 */
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

function storeTemperatureUnit(unit: TemperatureUnit) {
  try {
    window.localStorage.setItem(TEMPERATURE_UNIT_STORAGE_KEY, unit);
  } catch {
    // Not persisted; the choice still holds for this visit.
  }
}

type TemperatureUnitProviderProps = {
  children: ReactNode;
  /**
   * The signed-in user's preference. When given, the provider follows it (and copies it to this
   * browser's storage) instead of the stored value; `onUnitChange` is told of every change so it
   * can be saved on the server.
   */
  unit?: TemperatureUnit;
  onUnitChange?: (unit: TemperatureUnit) => void;
};

export function TemperatureUnitProvider({ children, unit: accountUnit, onUnitChange }: TemperatureUnitProviderProps) {
  const [storedUnit, setStoredUnit] = useState<TemperatureUnit>(readStoredTemperatureUnit);
  const unit = accountUnit ?? storedUnit;

  // The account's preference replaces this browser's default, so the next sign-in page agrees.
  useEffect(() => {
    if (accountUnit) storeTemperatureUnit(accountUnit);
  }, [accountUnit]);

  const setUnit = useCallback(
    (next: TemperatureUnit) => {
      setStoredUnit(next);
      storeTemperatureUnit(next);
      onUnitChange?.(next);
    },
    [onUnitChange],
  );

  // Another tab changed the scale: follow it (only the browser default; an account follows its own setting).
  useEffect(() => {
    const onStorage = (event: StorageEvent) => {
      if (event.key === TEMPERATURE_UNIT_STORAGE_KEY && isTemperatureUnit(event.newValue)) setStoredUnit(event.newValue);
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
