/**
 * Client code (modules marked "use client", the web workers, and everything they import) is sent to
 * the browser. None of it may reach `db/` (not even for a type: the schema module would follow the
 * types into the bundle the moment someone imports a value next to them) nor a module marked
 * `import "server-only"`. A "use server" module is where the walk stops: the client receives references to
 * its actions, not its code.
 */
import { describe, expect, it } from "vitest";
import { allSources, directive, reachable, sourceText } from "../support/source-graph";

const sources = allSources();
const clientRoots = sources.filter((f) => directive(f) === "use client" || /\.worker\.tsx?$/.test(f));
const serverOnly = new Set(sources.filter((f) => /^import\s+["']server-only["']/m.test(sourceText(f))));

describe("client modules never reach the database or server-only code", () => {
  it("finds the client modules (the walk is looking at something)", () => {
    expect(clientRoots.length).toBeGreaterThan(20);
    // status-mark.tsx has no directive of its own: it is client code because the library table imports it
    const reached = new Set(clientRoots.flatMap((r) => [...reachable(r).keys()]));
    expect(reached).toContain("components/ui/status-mark.tsx");
  });

  it("no client module imports db/ or a server-only module, directly or through others", () => {
    const problems: string[] = [];
    for (const root of clientRoots) {
      for (const [file, via] of reachable(root, (f) => directive(f) === "use server")) {
        if (file.startsWith("db/") || serverOnly.has(file)) problems.push(via.join(" → "));
      }
    }
    expect(problems, `client code reaches server code; move the shared piece into lib/ (e.g. lib/domain.ts):\n${problems.join("\n")}`).toEqual([]);
  });
});
