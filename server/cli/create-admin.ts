import { createInterface } from "node:readline";
import { Writable } from "node:stream";
import { Command } from "commander";
import { emailSchema, passwordSchema, personNameSchema } from "../../shared/schemas/auth.js";
import { ConfigError, loadDotEnv, parseEnv } from "../config/env.js";
import { createDataSource, databaseTarget } from "../db/data-source.js";
import { createLogger } from "../lib/logger.js";
import { AppError } from "../lib/errors.js";
import { UsersService } from "../modules/users/users.service.js";

/** Reads a line without echoing it (a password typed at a terminal). */
async function askHidden(question: string): Promise<string> {
  let muted = false;
  const output = new Writable({
    write(chunk, _enc, cb) {
      if (!muted) process.stdout.write(chunk);
      cb();
    },
  });
  const rl = createInterface({ input: process.stdin, output, terminal: process.stdin.isTTY });
  process.stdout.write(question);
  muted = true;
  const answer = await new Promise<string>((resolve) => rl.question("", resolve));
  muted = false;
  rl.close();
  process.stdout.write("\n");
  return answer;
}

async function readStdin(): Promise<string> {
  const chunks: Buffer[] = [];
  for await (const chunk of process.stdin) chunks.push(chunk as Buffer);
  return Buffer.concat(chunks).toString("utf8").replace(/\r?\n$/, "");
}

const program = new Command()
  .name("admin:create")
  .description("Create an admin account (the first one, outside demo mode) in the database of DATABASE_URL or DATABASE_PATH")
  .requiredOption("--email <address>", "the admin's e-mail address (their sign-in)")
  .requiredOption("--name <name>", "the admin's name as shown in the app")
  .option("--password-stdin", "read the password from standard input instead of asking")
  .action(async (opts: { email: string; name: string; passwordStdin?: boolean }) => {
    loadDotEnv();
    const env = parseEnv();
    const email = emailSchema.safeParse(opts.email);
    const name = personNameSchema.safeParse(opts.name);
    if (!email.success || !name.success) {
      console.error(!email.success ? `--email: ${email.error.issues[0]?.message}` : `--name: ${name.error!.issues[0]?.message}`);
      process.exit(2);
    }
    const typed = opts.passwordStdin ? await readStdin() : await askHidden("Password (at least 10 characters): ");
    const password = passwordSchema.safeParse(typed);
    if (!password.success) {
      console.error(`Password: ${password.error.issues[0]?.message}`);
      process.exit(2);
    }
    if (!opts.passwordStdin && (await askHidden("Same password again: ")) !== typed) {
      console.error("The two passwords differ; nothing was created.");
      process.exit(2);
    }
    const dataSource = createDataSource(databaseTarget(env));
    await dataSource.initialize();
    await dataSource.runMigrations({ transaction: "each" });
    const logger = createLogger("silent");
    // No mail is sent: the admin is created with a password, so neither secret nor mailer is used.
    const users = new UsersService(dataSource, { secret: "unused", appUrl: "", mailer: { enqueue: async () => {} }, logger });
    try {
      const user = await users.createWithPassword({ name: name.data, email: email.data, role: "admin", password: password.data });
      console.log(`Admin ${user.name} <${user.email}> created in ${env.DATABASE_PATH}. Sign in at the app's address.`);
    } catch (err) {
      if (err instanceof AppError) {
        console.error(err.message);
        process.exit(1);
      }
      throw err;
    } finally {
      await dataSource.destroy();
    }
  });

program.parseAsync().catch((err: unknown) => {
  console.error(err instanceof ConfigError ? err.message : err);
  process.exit(1);
});
