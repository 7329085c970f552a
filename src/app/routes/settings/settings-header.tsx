import type { ReactNode } from "react";
import { SettingsTabs } from "../../../features/settings/components/settings-tabs";

/** The heading and the settings area's own links, above every settings page. */
export function SettingsHeader({ title, lead, children }: { title: string; lead?: ReactNode; children?: ReactNode }) {
  return (
    <div className="mb-6 flex flex-col gap-3">
      <SettingsTabs />
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-3xl font-bold leading-tight">{title}</h1>
          {lead && <div className="mt-1 max-w-3xl text-lg text-muted">{lead}</div>}
        </div>
        {children}
      </div>
    </div>
  );
}
