/**
 * Client weight: builds the app (vite build into a scratch folder, with its manifest) and sums
 * the gzip sizes of what the first page loads — index.html's entry script, the chunks it imports
 * statically and the CSS of them, plus the dashboard route ("/", the first page after sign-in),
 * loaded lazily, with its own static imports — and finds the largest lazy chunk.
 */
import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { gzipSync } from "node:zlib";
import { PROJECT_ROOT } from "../server/index.js";

interface ManifestChunk {
  file: string;
  src?: string;
  isEntry?: boolean;
  isDynamicEntry?: boolean;
  imports?: string[];
  dynamicImports?: string[];
  css?: string[];
}

export interface ClientSize {
  firstLoadJsGzipKb: number;
  firstLoadCssGzipKb: number;
  entryJsGzipKb: number;
  largestLazyChunkGzipKb: number;
  largestLazyChunk: string;
  firstLoadFiles: string[];
}

export function measureClient(): ClientSize {
  const out = mkdtempSync(join(tmpdir(), "benchwarden-bench-dist-"));
  try {
    const build = spawnSync(process.execPath, [join(PROJECT_ROOT, "node_modules/vite/bin/vite.js"), "build", "--outDir", out, "--emptyOutDir", "--logLevel", "error"], {
      cwd: PROJECT_ROOT,
      encoding: "utf8",
      timeout: 180_000,
    });
    if (build.status !== 0) throw new Error(`vite build failed: ${build.stderr || build.stdout}`);
    const manifest = JSON.parse(readFileSync(join(out, ".vite/manifest.json"), "utf8")) as Record<string, ManifestChunk>;
    const gzKb = (file: string) => gzipSync(readFileSync(join(out, file))).length / 1024;
    const closure = (keys: string[], seen = new Set<string>()): Set<string> => {
      for (const key of keys) {
        if (seen.has(key) || !manifest[key]) continue;
        seen.add(key);
        closure(manifest[key].imports ?? [], seen);
      }
      return seen;
    };
    // What index.html references (entry script, modulepreloads, stylesheets).
    const html = readFileSync(join(out, "index.html"), "utf8");
    const referenced = [...html.matchAll(/(?:src|href)="\/?([^"]+\.(?:js|css))"/g)].map((m) => m[1]!);
    const entryKeys = Object.keys(manifest).filter((k) => manifest[k]!.isEntry);
    const dashboardKey = Object.keys(manifest).find((k) => /app\/routes\/dashboard(\/index)?\.tsx$/.test(k));
    const first = closure([...entryKeys, ...(dashboardKey ? [dashboardKey] : [])]);
    const files = new Set<string>(referenced);
    for (const key of first) {
      files.add(manifest[key]!.file);
      for (const css of manifest[key]!.css ?? []) files.add(css);
    }
    const js = [...files].filter((f) => f.endsWith(".js"));
    const css = [...files].filter((f) => f.endsWith(".css"));
    const entryJs = closure(entryKeys);
    // Lazy: every chunk the first page does not load (route modules and the chunks they share).
    const lazy = Object.values(manifest).filter((c) => c.file.endsWith(".js") && !files.has(c.file));
    const largest = lazy.map((c) => ({ name: c.src ?? c.file, kb: gzKb(c.file) })).sort((a, b) => b.kb - a.kb)[0];
    const r1 = (x: number) => Number(x.toFixed(1));
    return {
      firstLoadJsGzipKb: r1(js.reduce((a, f) => a + gzKb(f), 0)),
      firstLoadCssGzipKb: r1(css.reduce((a, f) => a + gzKb(f), 0)),
      entryJsGzipKb: r1([...entryJs].reduce((a, k) => a + gzKb(manifest[k]!.file), 0)),
      largestLazyChunkGzipKb: r1(largest?.kb ?? 0),
      largestLazyChunk: largest?.name ?? "",
      firstLoadFiles: [...files],
    };
  } finally {
    rmSync(out, { recursive: true, force: true });
  }
}

if (process.argv[1]?.endsWith("client-size.ts")) console.log(JSON.stringify(measureClient()));
