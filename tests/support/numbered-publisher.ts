/**
 * A publisher process for the crash test: plays a few sensors, each sending numbered QoS 1
 * readings (one per message, each at its own millisecond) at a steady pace, reconnecting
 * whenever the server goes away. mqtt.js keeps unacknowledged messages and re-sends them after
 * reconnecting. Prints "acked <n>" as acknowledgements arrive and "done <n>" when all are in.
 *
 *   tsx numbered-publisher.ts <mqtt-url> <credentials.json> <total> <per-second>
 */
import { readFileSync } from "node:fs";
import mqtt from "mqtt";

const [url, credentialsPath, totalText, rateText] = process.argv.slice(2) as [string, string, string, string];
const total = Number(totalText);
const perSecond = Number(rateText);
const sensors = (JSON.parse(readFileSync(credentialsPath, "utf8")) as { id: string; secret: string }[]).slice(0, 4);
const perSensor = Math.ceil(total / sensors.length);
const baseMs = Date.now() - 60_000;

let acked = 0;
let retries = 0;
let lastReported = 0;
const report = () => {
  if (acked - lastReported >= 250 || acked === total) {
    lastReported = acked;
    process.stdout.write(`acked ${acked}\n`);
  }
};

// Asked to stop: say exactly how many were acknowledged, then go.
process.on("SIGTERM", () => {
  process.stdout.write(`stopped ${acked}\n`);
  process.exit(0);
});

const deadline = setTimeout(() => {
  process.stdout.write(`timeout ${acked}\n`);
  process.exit(1);
}, 120_000);

await Promise.all(
  sensors.map(async (sensor, index) => {
    const client = mqtt.connect(url, {
      username: sensor.id,
      password: sensor.secret,
      clientId: `crash-test-${sensor.id}`,
      reconnectPeriod: 200,
      connectTimeout: 2000,
    });
    client.on("error", () => undefined);
    const topic = `benchwarden/v1/sensors/${sensor.id}/readings`;
    const sends: Promise<void>[] = [];
    const intervalMs = (1000 * sensors.length) / perSecond;
    for (let seq = 0; seq < perSensor && index * perSensor + seq < total; seq++) {
      const timeMs = baseMs + seq;
      const pack = [{ n: "air.temperature", u: "Cel", v: 20 + (seq % 100) / 100, t: timeMs / 1000 }];
      sends.push(
        new Promise<void>((resolve) => {
          // Resolves on PUBACK. A message in flight when the connection drops fails with
          // "Connection closed": like a real device, send it again until it is acknowledged.
          const send = () =>
            client.publish(topic, JSON.stringify(pack), { qos: 1 }, (err) => {
              if (err) {
                retries++;
                setTimeout(send, 100);
                return;
              }
              acked++;
              report();
              resolve();
            });
          send();
        }),
      );
      await new Promise((r) => setTimeout(r, intervalMs));
    }
    await Promise.all(sends);
    await client.endAsync();
  }),
);
clearTimeout(deadline);
process.stdout.write(`retried ${retries}\n`);
process.stdout.write(`done ${acked}\n`);
process.exit(0);
