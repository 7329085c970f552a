/** MQTT topics of the sensor contract (PRODUCT.md §4). */
export const TOPIC_PREFIX = "benchwarden/v1/sensors/";

export function readingsTopic(sensorId: string): string {
  return `${TOPIC_PREFIX}${sensorId}/readings`;
}

export function statusTopic(sensorId: string): string {
  return `${TOPIC_PREFIX}${sensorId}/status`;
}

export type SensorTopic = { sensorId: string; kind: "readings" | "status" };

/** benchwarden/v1/sensors/<id>/readings|status → its parts; anything else → null. */
export function parseSensorTopic(topic: string): SensorTopic | null {
  if (!topic.startsWith(TOPIC_PREFIX)) return null;
  const parts = topic.slice(TOPIC_PREFIX.length).split("/");
  if (parts.length !== 2) return null;
  const [sensorId, kind] = parts as [string, string];
  if (!sensorId || (kind !== "readings" && kind !== "status")) return null;
  return { sensorId, kind };
}

/**
 * What a server instance subscribes to at an external broker: every sensor's readings and status
 * (last will), through a shared subscription so the instances of one group split the messages.
 */
export function sharedSensorFilters(group: string): { readings: string; status: string } {
  return { readings: `$share/${group}/${TOPIC_PREFIX}+/readings`, status: `$share/${group}/${TOPIC_PREFIX}+/status` };
}
