import path from "node:path";
import ts from "typescript";
import { directive, listSources, ROOT, sourceText } from "./source-graph";

/**
 * What the app folder exposes to the network, read from the source files themselves: every route
 * handler (each exported HTTP method of each app/**\/route.ts) and every server action (each exported
 * async function of a "use server" module, and each function whose body opens with "use server").
 * The authorisation sweep compares its rows with this list, so a new route or action cannot go
 * unchecked.
 */

export const HTTP_METHODS = ["GET", "HEAD", "POST", "PUT", "PATCH", "DELETE", "OPTIONS"] as const;

export interface RouteEntry {
  /** e.g. "PATCH /api/chains/:id/members/:userId" */
  key: string;
  method: string;
  /** project-relative file, e.g. "app/api/chains/[id]/route.ts" */
  file: string;
}

export interface ActionEntry {
  /** e.g. "action app/(workspace)/settings/actions.ts saveNotificationSettings" */
  key: string;
  name: string;
  file: string;
}

/** The URL pattern of a route file: route groups dropped, [id] → :id, [...rest] → *rest. */
export function routePattern(file: string): string {
  const dir = path.posix.dirname(file).replace(/^app/, "");
  const segments = dir
    .split("/")
    .filter((s) => s && !/^\(.*\)$/.test(s))
    .map((s) => s.replace(/^\[\[?\.\.\.(.+?)\]?\]$/, "*$1").replace(/^\[(.+)\]$/, ":$1"));
  return "/" + segments.join("/");
}

function hasExport(node: ts.Node): boolean {
  return ts.canHaveModifiers(node) && (ts.getModifiers(node) ?? []).some((m) => m.kind === ts.SyntaxKind.ExportKeyword);
}

function parse(file: string): ts.SourceFile {
  return ts.createSourceFile(file, sourceText(file), ts.ScriptTarget.Latest, true, file.endsWith(".tsx") ? ts.ScriptKind.TSX : ts.ScriptKind.TS);
}

/** Names a module exports: `export function`, `export const X`, `export const { A, B } = …`, `export { A, B }`. */
export function exportedNames(file: string): { name: string; node: ts.Node }[] {
  const out: { name: string; node: ts.Node }[] = [];
  for (const st of parse(file).statements) {
    if (ts.isFunctionDeclaration(st) && st.name && hasExport(st)) out.push({ name: st.name.text, node: st });
    if (ts.isVariableStatement(st) && hasExport(st)) {
      for (const d of st.declarationList.declarations) {
        if (ts.isIdentifier(d.name)) out.push({ name: d.name.text, node: d });
        else if (ts.isObjectBindingPattern(d.name)) {
          for (const el of d.name.elements) if (ts.isIdentifier(el.name)) out.push({ name: el.name.text, node: el });
        }
      }
    }
    if (ts.isExportDeclaration(st) && st.exportClause && ts.isNamedExports(st.exportClause)) {
      for (const el of st.exportClause.elements) out.push({ name: el.name.text, node: el });
    }
  }
  return out;
}

export function appRoutes(): RouteEntry[] {
  const out: RouteEntry[] = [];
  for (const file of listSources("app").filter((f) => /\/route\.tsx?$/.test(f))) {
    for (const { name } of exportedNames(file)) {
      if ((HTTP_METHODS as readonly string[]).includes(name)) out.push({ key: `${name} ${routePattern(file)}`, method: name, file });
    }
  }
  return out.sort((a, b) => a.key.localeCompare(b.key));
}

function opensWithUseServer(body: ts.Node | undefined): boolean {
  if (!body || !ts.isBlock(body)) return false;
  const first = body.statements[0];
  return !!first && ts.isExpressionStatement(first) && ts.isStringLiteral(first.expression) && first.expression.text === "use server";
}

export function serverActions(): ActionEntry[] {
  const out: ActionEntry[] = [];
  for (const file of [...listSources("app"), ...listSources("components"), ...listSources("lib")]) {
    if (directive(file) === "use server") {
      for (const { name } of exportedNames(file)) out.push({ key: `action ${file} ${name}`, name, file });
      continue;
    }
    if (!sourceText(file).includes("use server")) continue;
    // inline actions: a function whose own body starts with the directive
    const visit = (node: ts.Node): void => {
      if ((ts.isFunctionDeclaration(node) || ts.isFunctionExpression(node) || ts.isArrowFunction(node) || ts.isMethodDeclaration(node)) && opensWithUseServer(node.body)) {
        const named = ts.isFunctionDeclaration(node) && node.name ? node.name.text : ts.isVariableDeclaration(node.parent) && ts.isIdentifier(node.parent.name) ? node.parent.name.text : `line ${parse(file).getLineAndCharacterOfPosition(node.getStart()).line + 1}`;
        out.push({ key: `action ${file} ${named}`, name: named, file });
      }
      ts.forEachChild(node, visit);
    };
    visit(parse(file));
  }
  return out.sort((a, b) => a.key.localeCompare(b.key));
}

/** Import a project module by its project-relative path (for checking that a row calls the real export). */
export function importProjectModule(file: string): Promise<Record<string, unknown>> {
  return import(/* @vite-ignore */ path.join(ROOT, file));
}
