/**
 * Waveform and response uploads: every bad CSV refused with its line named and nothing stored (no row,
 * no file in the store), a viewer reads but cannot upload, a file over the limit gets 413, deletion
 * removes row and bytes, by an editor as well as the owner, and deleting the chain removes its files' bytes.
 */
import { existsSync, readdirSync } from "node:fs";
import path from "node:path";
import { describe, expect, it, vi } from "vitest";
import { idContext, jsonRequest, paramsContext, sessionModule, signInAs } from "./session-mock";

vi.mock("@/lib/auth/session", () => sessionModule);

import { GET as list, POST as upload } from "@/app/api/chains/[id]/uploads/route";
import { DELETE as remove, GET as read } from "@/app/api/chains/[id]/uploads/[fileId]/route";
import { DELETE as deleteChain } from "@/app/api/chains/[id]/route";
import { insertChain } from "@/db/queries/chains";
import { WAVEFORM_LIMITS } from "@/lib/waveform-csv";
import { makeTeam, makeUser, share } from "../support/fixtures";
import { freshDatabasePerTest } from "../support/temp-db";

freshDatabasePerTest();

function world() {
  const owner = makeUser("owner");
  const viewer = makeUser("viewer");
  const editor = makeUser("editor");
  const reviewer = makeUser("reviewer");
  const teamId = makeTeam("Keel", [[owner, "engineer"]]);
  const doc = { format: "chainwright.chain/1", name: "Channel A", nodes: [], edges: [] };
  const chainId = insertChain({ teamId, name: "Channel A", document: doc, userId: owner.id }).id;
  share(chainId, viewer, "viewer");
  share(chainId, editor, "editor");
  share(chainId, reviewer, "reviewer");
  const otherChainId = insertChain({ teamId, name: "Channel B", document: { ...doc, name: "Channel B" }, userId: owner.id }).id;
  return { owner, viewer, editor, reviewer, chainId, otherChainId };
}

const storedFiles = () => {
  const root = path.join(path.dirname(process.env.DATABASE_PATH!), "files");
  if (!existsSync(root)) return [];
  return readdirSync(root, { recursive: true, withFileTypes: true }).filter((d) => d.isFile());
};

const post = (chainId: string, body: unknown) => upload(jsonRequest("POST", "/x", body), idContext(chainId));
const GOOD = "time_s,voltage_v\n0,0.012\n0.001,0.012\n0.002,0.020\n0.003,0.020\n";

describe("uploads", () => {
  it("stores a waveform, lists it, returns its text and deletes it", async () => {
    const w = world();
    signInAs(w.owner);
    const res = await post(w.chainId, { kind: "waveform", name: "step.csv", csv: GOOD });
    expect(res.status).toBe(201);
    const { file } = await res.json();
    expect(file).toMatchObject({ kind: "waveform", name: "step.csv", rows: 4, size: GOOD.length });
    expect(file.sampleRate).toBeCloseTo(1000, 9);
    expect(storedFiles()).toHaveLength(1);

    signInAs(w.viewer);
    const listed = await (await list(jsonRequest("GET", "/x"), idContext(w.chainId))).json();
    expect(listed.files.map((f: { id: string }) => f.id)).toEqual([file.id]);
    expect(listed.canUpload).toBe(false);
    const got = await read(jsonRequest("GET", "/x"), paramsContext({ id: w.chainId, fileId: file.id }));
    expect(got.status).toBe(200);
    expect(got.headers.get("content-type")).toMatch(/text\/csv/);
    expect(await got.text()).toBe(GOOD);

    expect((await remove(jsonRequest("DELETE", "/x"), paramsContext({ id: w.chainId, fileId: file.id }))).status).toBe(403);
    signInAs(w.owner);
    expect((await remove(jsonRequest("DELETE", "/x"), paramsContext({ id: w.chainId, fileId: file.id }))).status).toBe(200);
    expect(storedFiles()).toHaveLength(0);
    expect((await read(jsonRequest("GET", "/x"), paramsContext({ id: w.chainId, fileId: file.id }))).status).toBe(404);
    expect((await remove(jsonRequest("DELETE", "/x"), paramsContext({ id: w.chainId, fileId: file.id }))).status).toBe(404);
  });

  it("lets an editor delete a file (row and bytes) and refuses a reviewer", async () => {
    const w = world();
    signInAs(w.owner);
    const { file } = await (await post(w.chainId, { kind: "response", name: "bench.csv", csv: "10,0,-1\n100,-3,-45\n" })).json();
    const at = paramsContext({ id: w.chainId, fileId: file.id });
    signInAs(w.reviewer);
    expect((await remove(jsonRequest("DELETE", "/x"), at)).status).toBe(403);
    expect(storedFiles()).toHaveLength(1);
    signInAs(w.editor);
    expect((await remove(jsonRequest("DELETE", "/x"), at)).status).toBe(200);
    expect(storedFiles()).toHaveLength(0);
    expect((await (await list(jsonRequest("GET", "/x"), idContext(w.chainId))).json()).files).toEqual([]);
  });

  it("refuses to delete another chain's file through this chain", async () => {
    const w = world();
    signInAs(w.owner);
    const { file } = await (await post(w.otherChainId, { kind: "waveform", name: "b.csv", csv: GOOD })).json();
    expect((await remove(jsonRequest("DELETE", "/x"), paramsContext({ id: w.chainId, fileId: file.id }))).status).toBe(404);
    expect(storedFiles()).toHaveLength(1);
  });

  it("deleting a chain removes its files' bytes and leaves another chain's alone", async () => {
    const w = world();
    signInAs(w.owner);
    await post(w.chainId, { kind: "waveform", name: "a.csv", csv: GOOD });
    await post(w.chainId, { kind: "response", name: "a-bench.csv", csv: "10,0,-1\n100,-3,-45\n" });
    const { file: kept } = await (await post(w.otherChainId, { kind: "waveform", name: "b.csv", csv: GOOD })).json();
    expect(storedFiles()).toHaveLength(3);
    expect((await deleteChain(jsonRequest("DELETE", "/x"), idContext(w.chainId))).status).toBe(200);
    const left = storedFiles();
    expect(left).toHaveLength(1);
    expect(left[0].name).toContain(kept.id);
    const got = await read(jsonRequest("GET", "/x"), paramsContext({ id: w.otherChainId, fileId: kept.id }));
    expect(await got.text()).toBe(GOOD);
  });

  it("stores a measured response", async () => {
    const w = world();
    signInAs(w.owner);
    const res = await post(w.chainId, { kind: "response", name: "bench.csv", csv: "f,dB,deg\n10,0,-1\n100,-3,-45\n" });
    expect(res.status).toBe(201);
    expect((await res.json()).file).toMatchObject({ kind: "response", rows: 2, sampleRate: null });
  });

  const bad: [string, Record<string, unknown>, number | null, RegExp][] = [
    ["a missing value", { csv: "t,v\n0,1\n0.001,\n" }, 3, /missing/],
    ["a value that is not a number", { csv: "t,v\n0,1\n0.001,1\n0.002,one\n" }, 4, /not a number/],
    ["time going backwards", { csv: "t,v\n0,1\n0.002,1\n0.001,1\n" }, 4, /not after/],
    ["uneven sampling", { csv: "t,v\n0,1\n0.001,1\n0.0025,1\n0.003,1\n0.004,1\n" }, 4, /uneven/],
    ["uneven beyond a stated 5 %", { csv: "t,v\n0,1\n0.001,1\n0.00215,1\n0.003,1\n", tolerance: 0.05 }, 4, /tolerance 5 %/],
    ["a one-column file without its rate", { csv: "1\n2\n" }, null, /sample rate/],
    ["too many values on a line", { csv: "t,v\n0,1\n0.001,1,2\n" }, 3, /3 values/],
    ["binary content", { csv: "t,v\n0,1\n\u0001\u0002,1\n" }, 3, /control character/],
    ["a response with falling frequency", { kind: "response", csv: "100,0,0\n10,0,0\n" }, 2, /must increase/],
  ];
  for (const [what, body, line, msg] of bad) {
    it(`refuses ${what} with its line named, storing nothing`, async () => {
      const w = world();
      signInAs(w.owner);
      const res = await post(w.chainId, { kind: "waveform", name: "x.csv", ...body });
      expect(res.status).toBe(400);
      const { errors } = await res.json();
      const hit = errors.find((e: { line: number | null; message: string }) => e.line === line && msg.test(e.message));
      expect(hit, JSON.stringify(errors)).toBeDefined();
      if (line !== null) expect(hit.message).toContain(`line ${line}`);
      expect((await (await list(jsonRequest("GET", "/x"), idContext(w.chainId))).json()).files).toEqual([]);
      expect(storedFiles()).toHaveLength(0);
    });
  }

  it("refuses too many rows, naming the first line over the limit", async () => {
    const w = world();
    signInAs(w.owner);
    const n = WAVEFORM_LIMITS.maxRows + 1;
    const csv = Array.from({ length: n }, () => "0").join("\n");
    const res = await post(w.chainId, { kind: "waveform", name: "long.csv", csv, sampleRate: 1e6 });
    expect(res.status).toBe(400);
    const { errors } = await res.json();
    expect(errors[0].message).toMatch(/at most 1000000/);
    expect(errors[0].line).toBe(n);
    expect(storedFiles()).toHaveLength(0);
  });

  it("answers 413 for a file over the size limit, storing nothing", async () => {
    const w = world();
    signInAs(w.owner);
    const csv = "0.000001\n".repeat(Math.ceil(WAVEFORM_LIMITS.maxBytes / 9) + 10);
    const res = await post(w.chainId, { kind: "waveform", name: "big.csv", csv, sampleRate: 1e6 });
    expect(res.status).toBe(413);
    expect(storedFiles()).toHaveLength(0);
  });

  it("refuses a bad name or kind by field, and a viewer with 403", async () => {
    const w = world();
    signInAs(w.owner);
    const res = await post(w.chainId, { kind: "video", name: "../x", csv: GOOD });
    expect(res.status).toBe(400);
    const paths = (await res.json()).errors.map((e: { path: string }) => e.path).sort();
    expect(paths).toEqual(["kind", "name"]);
    signInAs(w.viewer);
    expect((await post(w.chainId, { kind: "waveform", name: "ok.csv", csv: GOOD })).status).toBe(403);
    expect(storedFiles()).toHaveLength(0);
  });
});
