import { problemSchema } from "../../../../shared/api-error.js";
import type { TemperatureUnit } from "../../../../shared/domain/units.js";
import type { ExportInterval } from "../../../../shared/schemas/exports.js";
import { ApiError } from "../../../lib/api-client";

export type ReadingsExportParams = {
  /** Exactly one of the two (shared/schemas/exports.ts). */
  benchId?: number;
  zoneId?: number;
  fromMs: number;
  toMs: number;
  interval: ExportInterval;
  temperatureUnit: TemperatureUnit;
  moistureUnit: "ratio" | "percent";
};

/** The query string the server's `readingsExportQuerySchema` reads. */
export function readingsExportSearch(params: ReadingsExportParams): URLSearchParams {
  const search = new URLSearchParams();
  if (params.benchId !== undefined) search.set("benchId", String(params.benchId));
  if (params.zoneId !== undefined) search.set("zoneId", String(params.zoneId));
  search.set("from", new Date(params.fromMs).toISOString());
  search.set("to", new Date(params.toMs).toISOString());
  search.set("interval", params.interval);
  search.set("temperatureUnit", params.temperatureUnit);
  search.set("moistureUnit", params.moistureUnit);
  return search;
}

function filenameFrom(disposition: string | null): string {
  const match = disposition?.match(/filename="([^"]+)"/);
  return match?.[1] ?? "benchwarden-readings.csv";
}

/**
 * GET /api/exports/readings.csv: the file as a Blob with the server's file name. Not a query: a
 * download is asked for once, on a button press. Failures are ApiErrors like every other call.
 */
export async function getReadingsExport(params: ReadingsExportParams, { signal }: { signal?: AbortSignal } = {}): Promise<{ blob: Blob; filename: string }> {
  let response: Response;
  try {
    response = await fetch(`/api/exports/readings.csv?${readingsExportSearch(params)}`, {
      credentials: "same-origin",
      headers: { Accept: "text/csv, application/problem+json" },
      signal,
    });
  } catch (error) {
    if (signal?.aborted) throw error;
    throw new ApiError({ status: 0, code: "network-error", title: "No connection", detail: "The Benchwarden server could not be reached" });
  }
  if (!response.ok) {
    const text = await response.text().catch(() => "");
    let problem: ReturnType<typeof problemSchema.safeParse> | undefined;
    try {
      problem = problemSchema.safeParse(JSON.parse(text));
    } catch {
      problem = undefined;
    }
    if (problem?.success) throw new ApiError(problem.data);
    throw new ApiError({ status: response.status, code: "http-error", title: response.statusText || "Request failed", detail: `The server answered ${response.status}` });
  }
  return { blob: await response.blob(), filename: filenameFrom(response.headers.get("Content-Disposition")) };
}

/** Hands a Blob to the browser as a download. */
export function saveFile({ blob, filename }: { blob: Blob; filename: string }) {
  const url = URL.createObjectURL(blob);
  const link = document.createElement("a");
  link.href = url;
  link.download = filename;
  link.rel = "noopener";
  document.body.append(link);
  link.click();
  link.remove();
  window.setTimeout(() => URL.revokeObjectURL(url), 10_000);
}
