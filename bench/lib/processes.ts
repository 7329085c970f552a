import { spawn, type ChildProcess } from "node:child_process";
import { join } from "node:path";
import { createInterface } from "node:readline";
import { PROJECT_ROOT } from "../../server/index.js";

export const TSX = [join(PROJECT_ROOT, "node_modules/tsx/dist/cli.mjs"), "--tsconfig", join(PROJECT_ROOT, "tsconfig.server.json")];

/** A TypeScript child process whose stdout is read as JSON lines. */
export class JsonChild {
  readonly process: ChildProcess;
  private waiting: ((line: Record<string, unknown>) => void)[] = [];
  readonly lines: Record<string, unknown>[] = [];
  readonly exited: Promise<number | null>;
  stderr = "";

  constructor(file: string, env: Record<string, string>, nodeArgs: string[] = []) {
    // With node flags (e.g. --cpu-prof), tsx is loaded into this very process (--import) rather
    // than through its CLI, which would run the script in a child of its own.
    const args = nodeArgs.length ? [...nodeArgs, "--import", "tsx", join(PROJECT_ROOT, file)] : [...TSX, join(PROJECT_ROOT, file)];
    this.process = spawn(process.execPath, args, {
      cwd: PROJECT_ROOT,
      env: { ...process.env, TSX_TSCONFIG_PATH: join(PROJECT_ROOT, "tsconfig.server.json"), ...env },
      stdio: ["pipe", "pipe", "pipe"],
    });
    this.process.stderr!.on("data", (d: Buffer) => (this.stderr = (this.stderr + d.toString()).slice(-4000)));
    createInterface({ input: this.process.stdout! }).on("line", (line) => {
      let parsed: Record<string, unknown>;
      try {
        parsed = JSON.parse(line) as Record<string, unknown>;
      } catch {
        return;
      }
      const waiter = this.waiting.shift();
      if (waiter) waiter(parsed);
      else this.lines.push(parsed);
    });
    this.exited = new Promise((resolve) => this.process.once("exit", (code) => resolve(code)));
  }

  /** The next JSON line, or an error after timeoutMs or if the child exits first. */
  next(timeoutMs: number): Promise<Record<string, unknown>> {
    const queued = this.lines.shift();
    if (queued) return Promise.resolve(queued);
    return new Promise((resolve, reject) => {
      const timer = setTimeout(() => reject(new Error(`no answer within ${timeoutMs} ms; stderr: ${this.stderr}`)), timeoutMs);
      void this.exited.then((code) => {
        clearTimeout(timer);
        reject(new Error(`child exited (${code}); stderr: ${this.stderr}`));
      });
      this.waiting.push((line) => {
        clearTimeout(timer);
        resolve(line);
      });
    });
  }

  send(line: string): void {
    this.process.stdin!.write(`${line}\n`);
  }

  /** Ask it to stop; kill it (by its own PID) if it has not exited after graceMs. */
  async stop(graceMs = 15_000): Promise<void> {
    if (this.process.exitCode !== null) return;
    this.send("stop");
    const timer = setTimeout(() => this.process.kill("SIGKILL"), graceMs);
    await this.exited;
    clearTimeout(timer);
  }
}

export function sleepUntil(timeMs: number): Promise<void> {
  return new Promise((r) => setTimeout(r, Math.max(0, timeMs - Date.now())));
}
