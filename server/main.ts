import { ConfigError, loadDotEnv, parseEnv } from "./config/env.js";
import { DEMO_USERS } from "./demo/seed.js";
import { start } from "./index.js";

// The process entry point: configuration, start, signals. Everything else lives in start().
async function main(): Promise<void> {
  loadDotEnv();
  let env;
  try {
    env = parseEnv();
  } catch (err) {
    if (err instanceof ConfigError) {
      console.error(`Benchwarden cannot start.\n${err.message}`);
      process.exit(1);
    }
    throw err;
  }

  const server = await start(env).catch((err: unknown) => {
    console.error(err instanceof ConfigError ? `Benchwarden cannot start.\n${err.message}` : err);
    process.exit(1);
  });

  const fatal = (err: unknown) => {
    server.logger.fatal({ err }, "unexpected error; stopping");
    void server.stop().finally(() => process.exit(1));
  };
  process.on("unhandledRejection", fatal);
  process.on("uncaughtException", fatal);
  for (const signal of ["SIGINT", "SIGTERM"] as const) {
    process.once(signal, () => {
      server.logger.info({ signal }, "stopping");
      void server.stop().then(() => process.exit(0));
    });
  }

  const lines = [
    "",
    `  Benchwarden is running at ${server.appUrl}`,
    env.MQTT_URL
      ? `  Sensors publish to the external broker ${server.mqttUrl} (it signs them in; see docs/mosquitto.md)`
      : `  Sensors publish to mqtt://localhost:${server.mqttPort}`,
  ];
  if (server.demo) {
    lines.push("", "  Demo nursery: sign in as any of these, password " + JSON.stringify(env.DEMO_PASSWORD));
    for (const u of DEMO_USERS) lines.push(`    ${u.role.padEnd(8)} ${u.email}`);
    lines.push("", `  Sensor credentials: ${server.demoCredentialsPath}`);
    lines.push(`  ${env.SIM ?? true ? "The simulator is publishing demo readings." : "Simulator off (SIM=0)."}`);
  }
  if (server.smtpSinkPort !== null) lines.push(`  E-mail is caught by the local sink (port ${server.smtpSinkPort}); admins read it in the app.`);
  console.log(lines.join("\n") + "\n");
}

void main();
