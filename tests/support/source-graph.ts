import { existsSync, readdirSync, readFileSync, statSync } from "node:fs";
import path from "node:path";
import ts from "typescript";

/**
 * The project's own modules and the imports between them, read with the TypeScript parser (no
 * bundler): enough to ask which modules a client module reaches, and what the app folder exports.
 */
export const ROOT = path.resolve(__dirname, "../..");
const SOURCE_DIRS = ["app", "components", "lib", "db"];
const EXTENSIONS = [".ts", ".tsx"];

export function listSources(dir: string): string[] {
  const abs = path.join(ROOT, dir);
  if (!existsSync(abs)) return [];
  const out: string[] = [];
  for (const name of readdirSync(abs)) {
    const rel = path.join(dir, name);
    if (statSync(path.join(ROOT, rel)).isDirectory()) out.push(...listSources(rel));
    else if (EXTENSIONS.some((e) => name.endsWith(e)) && !name.endsWith(".d.ts")) out.push(rel.split(path.sep).join("/"));
  }
  return out.sort();
}

export function allSources(): string[] {
  return SOURCE_DIRS.flatMap(listSources);
}

const text = new Map<string, string>();
export function sourceText(file: string): string {
  let t = text.get(file);
  if (t === undefined) {
    t = readFileSync(path.join(ROOT, file), "utf8");
    text.set(file, t);
  }
  return t;
}

/** The directive prologue ("use client" / "use server") of a module, if any. */
export function directive(file: string): "use client" | "use server" | null {
  const sf = ts.createSourceFile(file, sourceText(file), ts.ScriptTarget.Latest, false);
  for (const st of sf.statements) {
    if (!ts.isExpressionStatement(st) || !ts.isStringLiteral(st.expression)) break;
    const v = st.expression.text;
    if (v === "use client" || v === "use server") return v;
  }
  return null;
}

/** Resolve an import specifier from `from` to a project file (null for packages). */
export function resolveImport(from: string, spec: string): string | null {
  let base: string;
  if (spec.startsWith("@/")) base = spec.slice(2);
  else if (spec.startsWith(".")) base = path.posix.normalize(path.posix.join(path.posix.dirname(from), spec));
  else return null;
  const candidates = [base, ...EXTENSIONS.map((e) => base + e), ...EXTENSIONS.map((e) => `${base}/index${e}`)];
  for (const c of candidates) {
    const abs = path.join(ROOT, c);
    if (existsSync(abs) && statSync(abs).isFile()) return c;
  }
  return null;
}

/** Every module specifier a file names: imports (type-only too), re-exports, dynamic imports, `new URL(x, import.meta.url)`. */
export function importsOf(file: string): string[] {
  const info = ts.preProcessFile(sourceText(file), true, true);
  const specs = info.importedFiles.map((f) => f.fileName);
  for (const m of sourceText(file).matchAll(/new URL\(\s*["']([^"']+)["']\s*,\s*import\.meta\.url/g)) specs.push(m[1]);
  return specs;
}

/**
 * Walk from `start` through project imports; returns each reached file with the chain that reached it.
 * `stopAt` files are listed but not walked into (a client module importing a "use server" module gets
 * references to its actions, not its code).
 */
export function reachable(start: string, stopAt: (file: string) => boolean = () => false): Map<string, string[]> {
  const seen = new Map<string, string[]>([[start, [start]]]);
  const queue = [start];
  while (queue.length) {
    const file = queue.shift()!;
    for (const spec of importsOf(file)) {
      const target = resolveImport(file, spec);
      if (!target || seen.has(target)) continue;
      seen.set(target, [...seen.get(file)!, target]);
      if (!stopAt(target)) queue.push(target);
    }
  }
  return seen;
}
