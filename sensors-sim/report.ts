import { formatDuration } from "./duration.js";
import type { FleetProgress, FleetSummary } from "./fleet.js";

function simSpan(simS: number): string {
  const m = Math.round(simS / 60);
  const d = Math.floor(m / 1440);
  const h = Math.floor((m % 1440) / 60);
  const mm = m % 60;
  return `${d > 0 ? `${d}d` : ""}${h}h${String(mm).padStart(2, "0")}m`;
}

/** The one-line progress report: sent, acknowledged, buffered, reconnects and the like. */
export function formatProgress(p: FleetProgress, qos: 0 | 1): string {
  const acked = qos === 1 ? `acked ${p.acknowledged}` : `written ${p.acknowledged}`;
  const parts = [
    `[${formatDuration(p.elapsedMs)}] sim ${p.simClock} (+${simSpan(p.simS)})`,
    `${p.online}/${p.sensors - p.dead} online${p.dead > 0 ? `, ${p.dead} dead` : ""}`,
    `sent ${p.sent}  ${acked}  in flight ${p.inFlight}`,
    `buffered ${p.buffered}${p.overflow > 0 ? ` (dropped ${p.overflow})` : ""}`,
    `reconnects ${p.reconnects}`,
  ];
  if (p.refused > 0) parts.push(`refused ${p.refused}`);
  if (p.lagMs > 1000) parts.push(`behind ${formatDuration(p.lagMs)}`);
  return parts.join(" | ");
}

/** The end-of-run summary, one fact per line. */
export function formatSummary(s: FleetSummary, speed: number): string {
  const ack =
    s.qos === 1
      ? `acknowledged ${s.acknowledged} (QoS 1)`
      : `written ${s.acknowledged} (QoS 0: no acknowledgement)`;
  const rows: Array<[string, string]> = [
    ["stopped by", s.stoppedBy],
    ["scenario", s.scenarioDescription],
    ["seed", String(s.seed)],
    ["time", `${formatDuration(s.elapsedMs)} wall, ${simSpan(s.simS)} simulated (${speed}×), sim clock ${s.simClock}`],
    ["sensors", `${s.sensors} (${s.online} online at the end${s.dead > 0 ? `, ${s.dead} dead` : ""})`],
    ["samples", `${s.samples} (${s.dropouts} lost to dropouts, ${s.garbage} replaced by garbage)`],
    ["packs", `${s.packs} holding ${s.readings} readings (${s.readingsPerSecond.toFixed(1)} readings/s)`],
    ["sent", `${s.sent}, ${ack}, ${s.failed} failed`],
    ["left unsent", `${s.unsent} (${s.buffered} buffered, ${s.inFlight} unacknowledged), ${s.overflow} dropped from full buffers`],
    ["connections", `${s.reconnects} reconnect attempts, ${s.refused} refused`],
  ];
  const width = Math.max(...rows.map(([k]) => k.length));
  return ["sensors-sim summary", ...rows.map(([k, v]) => `  ${k.padEnd(width)}  ${v}`)].join("\n");
}
