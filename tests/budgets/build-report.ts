/**
 * What each page of a production build sends to the browser, read from the build output itself (no
 * browser): the page's entry chunks from its client reference manifest (`entryJSFiles` of the root
 * layout, its group layout and the page) plus Next's root main files, then every chunk those reach
 * through a lazy import, found by the chunk file names each chunk's text mentions. Used by the
 * browser-test file that enforces the budgets and by `npm run budgets`, which prints the table.
 */
import { existsSync, readdirSync, readFileSync, statSync } from "node:fs";
import path from "node:path";
import { gzipSync } from "node:zlib";

/** A name only the plotting library's own code carries (one of its internal event names). */
export const PLOTLY_MARK = "plotly_relayout";

export interface PageReport {
  /** the app route, e.g. "/(workspace)/chains/[id]" */
  route: string;
  /** chunks the page loads before it runs (static/chunks/…) */
  initial: string[];
  initialBytes: number;
  initialGzip: number;
  /** chunks reachable later through lazy imports, not in `initial` */
  lazy: string[];
  lazyGzip: number;
  /** the plotting library is in an initial chunk */
  plotlyInitial: boolean;
  /** the plotting library is reachable at all (initially or lazily) */
  plotlyReachable: boolean;
}

export interface BuildReport {
  distDir: string;
  pages: PageReport[];
  /** every JavaScript file under static/ (what any browser may be sent) */
  clientFiles: string[];
}

function walk(dir: string, out: string[] = []): string[] {
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) walk(full, out);
    else out.push(full);
  }
  return out;
}

/** Read `globalThis.__RSC_MANIFEST[...] = {...}` without running it. */
function readClientManifest(file: string): { entryJSFiles?: Record<string, string[]> } {
  const text = readFileSync(file, "utf8");
  const start = text.indexOf("= {", text.indexOf("__RSC_MANIFEST["));
  return JSON.parse(text.slice(start + 2).replace(/;\s*$/, ""));
}

export function readBuild(distDir: string): BuildReport {
  if (!existsSync(path.join(distDir, "BUILD_ID"))) throw new Error(`${distDir} holds no finished build (no BUILD_ID); build first`);
  const staticDir = path.join(distDir, "static");
  const clientFiles = walk(staticDir).filter((f) => f.endsWith(".js"));
  const chunkText = new Map<string, string>();
  const rel = (f: string) => path.relative(distDir, f).split(path.sep).join("/");
  for (const f of clientFiles) chunkText.set(rel(f), readFileSync(f, "utf8"));
  const chunkNames = [...chunkText.keys()].filter((k) => k.startsWith("static/chunks/"));
  const byBase = new Map(chunkNames.map((k) => [path.basename(k, ".js"), k]));
  /** chunk → chunks whose file name its text mentions (lazy imports name their chunk files) */
  const refs = new Map<string, string[]>();
  const basePattern = /([0-9a-z_-]{8,}|turbopack-[0-9a-z_-]+)\.js/g;
  for (const [name, text] of chunkText) {
    const found = new Set<string>();
    for (const m of text.matchAll(basePattern)) {
      const target = byBase.get(m[1]);
      if (target && target !== name) found.add(target);
    }
    refs.set(name, [...found]);
  }
  const gz = new Map<string, number>();
  const gzipOf = (k: string) => {
    if (!gz.has(k)) gz.set(k, gzipSync(chunkText.get(k) ?? "").length);
    return gz.get(k)!;
  };
  const plotlyIn = new Set(chunkNames.filter((k) => chunkText.get(k)!.includes(PLOTLY_MARK) && statSync(path.join(distDir, k)).size > 1_000_000));

  const buildManifest = JSON.parse(readFileSync(path.join(distDir, "build-manifest.json"), "utf8")) as { rootMainFiles: string[] };
  const appDir = path.join(distDir, "server", "app");
  const manifests = walk(appDir).filter((f) => f.endsWith("page_client-reference-manifest.js"));
  const pages: PageReport[] = [];
  for (const file of manifests) {
    const route = "/" + path.relative(appDir, path.dirname(file)).split(path.sep).join("/");
    if (route.startsWith("/_")) continue; // Next's own error pages
    const manifest = readClientManifest(file);
    const initial = new Set<string>(buildManifest.rootMainFiles);
    for (const files of Object.values(manifest.entryJSFiles ?? {})) for (const f of files) initial.add(f);
    const reachable = new Set(initial);
    const queue = [...initial];
    while (queue.length) {
      for (const next of refs.get(queue.pop()!) ?? []) {
        if (reachable.has(next)) continue;
        reachable.add(next);
        queue.push(next);
      }
    }
    const init = [...initial].filter((k) => chunkText.has(k)).sort();
    const lazy = [...reachable].filter((k) => !initial.has(k)).sort();
    pages.push({
      route: route === "/" ? "/" : route,
      initial: init,
      initialBytes: init.reduce((s, k) => s + Buffer.byteLength(chunkText.get(k)!), 0),
      initialGzip: init.reduce((s, k) => s + gzipOf(k), 0),
      lazy,
      lazyGzip: lazy.reduce((s, k) => s + gzipOf(k), 0),
      plotlyInitial: init.some((k) => plotlyIn.has(k)),
      plotlyReachable: [...reachable].some((k) => plotlyIn.has(k)),
    });
  }
  pages.sort((a, b) => a.route.localeCompare(b.route));
  return { distDir, pages, clientFiles };
}

/**
 * Budget per page for the JavaScript loaded before the page runs, gzip-compressed kB (what travels).
 * Set a little above what the pages weigh now, so growth is a decision, not an accident. The workspace
 * gets the editor (React Flow, the forms, the direct SVG plots); the plotting library itself is lazy
 * and only the chain pages that draw plots may reach it.
 */
export const BUDGET_GZIP_KB: Array<{ match: RegExp; kb: number; plotly: boolean }> = [
  // the workspace and its read-only twin (/view renders the same editor with every edit off); raised from
  // 380 to 400 kB on 2026-12-04 when it reached 380 kB with the direct SVG first plot, the sensor inspector
  // (TIA loop, suggested cf) and the measured-response overlay; lowered to 360 kB the same day when the dock's
  // other tabs and the team side panels moved to lazy chunks loaded on first opening (343 kB then)
  { match: /^\/\(workspace\)\/chains\/\[id\](\/view)?$/, kb: 360, plotly: true },
  // the report renders its plots as images with the plotting library, loaded lazily
  { match: /^\/\(workspace\)\/chains\/\[id\]\/report$/, kb: 230, plotly: true },
  { match: /.*/, kb: 230, plotly: false },
];

export function budgetFor(route: string) {
  return BUDGET_GZIP_KB.find((b) => b.match.test(route))!;
}

/** Strings whose presence in any client file means a server secret or server-only setting leaked. */
export function leakedIn(files: string[], needles: Array<{ label: string; value: string }>): string[] {
  const found: string[] = [];
  for (const f of files) {
    const text = readFileSync(f, "utf8");
    for (const n of needles) if (n.value.length >= 6 && text.includes(n.value)) found.push(`${n.label} in ${f}`);
  }
  return found;
}

export function formatReport(report: BuildReport): string {
  const lines = [`JavaScript per page (${report.distDir}), kB: before the page runs (raw / gzip, budget), then lazily reachable (gzip)`];
  for (const p of report.pages) {
    const b = budgetFor(p.route);
    const flags = [p.plotlyInitial ? "plotting library UP FRONT" : p.plotlyReachable ? "plotting library lazy" : ""].filter(Boolean).join(" ");
    lines.push(
      `  ${p.route.padEnd(42)} ${(p.initialBytes / 1024).toFixed(0).padStart(6)} / ${(p.initialGzip / 1024).toFixed(0).padStart(4)} (≤ ${b.kb})   +${(p.lazyGzip / 1024).toFixed(0).padStart(5)}  ${flags}`,
    );
  }
  return lines.join("\n");
}
