import { cpSync, existsSync, mkdirSync, statSync } from "node:fs";
import { dirname, join, resolve } from "node:path";
import Database from "better-sqlite3";
import { Command } from "commander";
import { loadDotEnv, parseEnv } from "../config/env.js";

/**
 * A consistent copy of the live database, taken online through SQLite's backup API (better-sqlite3
 * `backup()`): the server keeps ingesting while it runs, and the copy is one point in time.
 */
export async function backupDatabase(databasePath: string, destination: string): Promise<{ path: string; bytes: number; pages: number }> {
  mkdirSync(dirname(destination), { recursive: true });
  const db = new Database(databasePath, { readonly: true, fileMustExist: true });
  try {
    // All pages in one step: stepping in small chunks restarts whenever the server commits
    // meanwhile, and under steady ingest a chunked backup would never finish.
    const { totalPages } = await db.backup(destination, { progress: () => 2_000_000_000 });
    return { path: destination, bytes: statSync(destination).size, pages: totalPages };
  } finally {
    db.close();
  }
}

const program = new Command()
  .name("backup")
  .description("Copy the database of DATABASE_PATH, consistently, while the server runs")
  .option("--to <file>", "where to write the copy (default: backups/benchwarden-<time>.sqlite beside the database)")
  .action(async (opts: { to?: string }) => {
    loadDotEnv();
    const env = parseEnv();
    if (env.DATABASE_URL) {
      console.error("DATABASE_URL is set: the database is PostgreSQL's. Back it up with PostgreSQL's own tools (pg_dump, or continuous archiving), and copy the photos folder (PHOTOS_DIR).");
      process.exit(2);
    }
    const stamp = new Date().toISOString().replace(/[:.]/g, "-");
    const destination = resolve(opts.to ?? join(dirname(env.DATABASE_PATH), "backups", `benchwarden-${stamp}.sqlite`));
    const result = await backupDatabase(env.DATABASE_PATH, destination);
    console.log(`Backed up ${env.DATABASE_PATH} to ${result.path} (${(result.bytes / 1024 / 1024).toFixed(1)} MB).`);
    // Photos are files beside the database, written once and never changed: a plain copy after
    // the database snapshot holds every photo the snapshot refers to.
    const photos = env.PHOTOS_DIR ? resolve(env.PHOTOS_DIR) : join(dirname(env.DATABASE_PATH), "photos");
    if (existsSync(photos)) {
      const photosCopy = destination.replace(/\.sqlite$/, "") + "-photos";
      cpSync(photos, photosCopy, { recursive: true });
      console.log(`Photos copied to ${photosCopy}.`);
    }
  });

if (process.argv[1] && resolve(process.argv[1]) === resolve(import.meta.filename)) {
  program.parseAsync().catch((err: unknown) => {
    console.error(err instanceof Error ? err.message : err);
    process.exit(1);
  });
}
