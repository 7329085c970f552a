import { EntitySchema } from "typeorm";

/** A manager's own named window set (built-in presets live in shared/domain/window-guidance.ts). */
export interface WindowPresetRecord {
  id: number;
  name: string;
  description: string;
  /** JSON array of QuantityWindow (stored units). */
  windows: string;
  dewPointMarginC: number;
  createdAtMs: number;
  updatedAtMs: number;
}

export const WindowPresetEntity = new EntitySchema<WindowPresetRecord>({
  name: "WindowPreset",
  tableName: "window_preset",
  columns: {
    id: { type: "integer", primary: true, generated: "increment" },
    name: { type: "varchar", length: 80 },
    description: { type: "varchar", length: 500, default: "" },
    windows: { type: "text" },
    dewPointMarginC: { type: "real", name: "dew_point_margin_c" },
    createdAtMs: { type: "integer", name: "created_at_ms" },
    updatedAtMs: { type: "integer", name: "updated_at_ms" },
  },
});
