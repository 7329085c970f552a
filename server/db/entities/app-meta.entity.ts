import { EntitySchema } from "typeorm";

/** Small key/value facts about this installation (e.g. whether it holds the demo nursery). */
export interface AppMeta {
  key: string;
  value: string;
}

export const AppMetaEntity = new EntitySchema<AppMeta>({
  name: "AppMeta",
  tableName: "app_meta",
  columns: {
    key: { type: "varchar", primary: true, length: 64 },
    value: { type: "text" },
  },
});
