/**
 * `npm run bench:spread-ui`: the Spread tab in headless Chromium against a production build, with the
 * engine benchmark's 10-stage chain (tests/bench/chains.ts) at 1,000 points.
 *
 *  1. Worker time: 1,000-build runs to the end (`--full-runs N`, default 3), the worker's own time from
 *     its `done` message (the issue's target: under 0.5 s), and one 10,000-build run to the end.
 *  2. A long run (`--watched N` builds, default 40,000, so it is still going at the cancel: 10,000 builds
 *     now end in about 4 s, before the typing is over) watched from the page: (a) alone up to 30 %: the longest main-thread task
 *     (Long Tasks API entries, 50 ms and over, and a timer-gap monitor that sees shorter ones), the
 *     longest script in a frame, the progress bar's values over time (it must move); (b) keystrokes
 *     typed into a value field of the inspector while it runs (keydown → next frame, input delay, and
 *     the Event Timing API's input to next paint), with the longest tasks while typing (those include the
 *     edit's own analysis and plot redraw); (c) a cancel: from the click to the worker's last message
 *     (its `cancelled`), and how many progress messages still came after the click.
 * Before the run, the same page is watched for 3 s with nothing running: on a busy machine the OS takes
 * the main thread away too, and that baseline says how much of a long task is the load's. The longest
 * script in a frame (Long Animation Frames API) is the app's own part.
 * Messages are seen by wrapping the page's Worker before the app loads (an init script), so nothing in
 * the app changes for the benchmark.
 *
 * Options: --reuse (an existing build: E2E_REUSE_BUILD=1), --full-runs N, --keys N (keystrokes, default 6),
 * --watched N (builds of the watched, typed-into and cancelled run).
 * Builds with the browser-test harness into E2E_DIST_DIR (default .next-e2e); prints `uptime`'s load.
 */
import { mkdirSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { chromium, type Browser, type Page } from "playwright-core";
import { CHROMIUM_FLAGS, CHROMIUM_PATH } from "../e2e/support/chromium";
import { startE2EServer } from "../e2e/support/server";
import { signInWithPassword } from "../e2e/support/auth";
import { DEMO_PASSWORD, DEMO_PEOPLE } from "../../db/seed-data/people";
import { tidyLayout } from "../../lib/store/graph";
import { benchChain } from "./chains";

const arg = (name: string, fallback: number) => {
  const i = process.argv.indexOf(`--${name}`);
  return i >= 0 ? Number(process.argv[i + 1]) : fallback;
};
const FULL_RUNS = arg("full-runs", 3);
const KEYS = arg("keys", 6);
const WATCHED = arg("watched", 40_000);
if (process.argv.includes("--reuse")) process.env.E2E_REUSE_BUILD = "1";
const ARTIFACTS = fileURLToPath(new URL("../../artifacts", import.meta.url));

/**
 * Runs in the page before the app (source text: tsx would wrap inner functions in a helper that exists
 * only in Node). `__cwSpread` keeps every worker message with its arrival time, the long tasks, the
 * timer gaps, the progress bar's values and the keystroke timings while `watch` is on.
 */
const INIT = `(() => {
  const b = { messages: [], longTasks: [], frames: [], events: [], keys: [], progress: [], maxGap: 0, gaps: 0, watching: false };
  window.__cwSpread = b;
  const Base = window.Worker;
  window.Worker = class extends Base {
    constructor(url, opts) {
      super(url, opts);
      this.addEventListener("message", (e) => {
        const d = e.data || {};
        b.messages.push({ t: performance.now(), type: d.type, done: d.done, total: d.total, ms: d.ms, partial: !!d.result && d.type === "progress" });
      });
    }
  };
  try {
    new PerformanceObserver((list) => { if (b.watching) for (const e of list.getEntries()) b.longTasks.push({ t: e.startTime, ms: e.duration }); }).observe({ type: "longtask" });
  } catch {}
  try {
    // long animation frames name the scripts that ran in them: what a long task was
    new PerformanceObserver((list) => {
      if (!b.watching) return;
      for (const e of list.getEntries())
        b.frames.push({ t: e.startTime, ms: e.duration, render: e.renderStart ? e.startTime + e.duration - e.renderStart : 0, layout: e.styleAndLayoutStart ? e.startTime + e.duration - e.styleAndLayoutStart : 0, scripts: (e.scripts || []).filter((x) => x.duration >= 5).map((x) => ({ ms: Math.round(x.duration), what: (x.invoker || "") + " " + (x.sourceFunctionName || "") + " " + String(x.sourceURL || "").split("/").pop() })) });
    }).observe({ type: "long-animation-frame" });
  } catch {}
  try {
    new PerformanceObserver((list) => {
      for (const e of list.getEntries()) if (e.name === "keydown" || e.name === "keyup" || e.name === "keypress")
        b.events.push({ name: e.name, t: e.startTime, ms: e.duration, delay: e.processingStart - e.startTime, id: e.interactionId });
    }).observe({ type: "event", durationThreshold: 16 });
  } catch {}
  document.addEventListener("keydown", (e) => {
    if (!b.watching) return;
    const t0 = e.timeStamp;
    const handled = performance.now();
    const marks = () => performance.getEntriesByType("mark").filter((m) => m.name.startsWith("cw:edit:"));
    const before = marks().length;
    // the next frame after the handlers ran: what the person sees
    requestAnimationFrame(() => setTimeout(() => {
      const m = marks();
      b.keys.push({ delay: handled - t0, frame: performance.now() - t0, edit: m.length > before ? m[m.length - 1].startTime - t0 : null });
    }, 0));
  }, true);
  // a timer chain: the largest gap between two turns is the longest the main thread was busy
  let last = performance.now();
  const tick = () => {
    const now = performance.now();
    if (b.watching) { b.maxGap = Math.max(b.maxGap, now - last); if (now - last > 50) b.gaps++; }
    last = now;
    setTimeout(tick, 0);
  };
  setTimeout(tick, 0);
  const bar = () => {
    if (b.watching) {
      const el = document.querySelector('[data-testid="spread-status"] [role="progressbar"]');
      if (el) b.progress.push({ t: performance.now(), v: Number(el.getAttribute("aria-valuenow")) });
    }
    setTimeout(bar, 100);
  };
  setTimeout(bar, 100);
})()`;

interface Message {
  t: number;
  type: string;
  done?: number;
  total?: number;
  ms?: number;
  partial: boolean;
}
interface Watch {
  messages: Message[];
  longTasks: { t: number; ms: number }[];
  frames: { t: number; ms: number; render: number; layout: number; scripts: { ms: number; what: string }[] }[];
  events: { name: string; t: number; ms: number; delay: number; id: number }[];
  keys: { delay: number; frame: number; edit: number | null }[];
  progress: { t: number; v: number }[];
  maxGap: number;
  gaps: number;
}

/**
 * Polls an expression from here until it is truthy (page.evaluate is outside the page's content
 * security policy; waitForFunction's polling inside the page would need eval, which the policy refuses).
 */
async function until(page: Page, expr: string, timeoutMs: number, everyMs = 20): Promise<void> {
  const end = Date.now() + timeoutMs;
  while (!(await page.evaluate(expr))) {
    if (Date.now() > end) throw new Error(`timed out waiting for ${expr}`);
    await new Promise((r) => setTimeout(r, everyMs));
  }
}

const watch = (page: Page, on: boolean) => page.evaluate(`(() => { const b = window.__cwSpread; b.watching = ${on}; if (${on}) { b.longTasks = []; b.frames = []; b.events = []; b.keys = []; b.progress = []; b.maxGap = 0; b.gaps = 0; } })()`);
const readWatch = (page: Page) => page.evaluate(`window.__cwSpread`) as Promise<Watch>;
const clearMessages = (page: Page) => page.evaluate(`window.__cwSpread.messages = []`);

async function startRun(page: Page, trials: number) {
  await page.getByTestId("spread-trials").fill(String(trials));
  await clearMessages(page);
  await page.getByTestId("spread-run").click();
}

/** Waits for the run to end (done or cancelled) and returns the worker's messages. */
async function untilEnd(page: Page, timeoutMs = 300_000): Promise<Message[]> {
  await until(page, `(() => { const m = window.__cwSpread.messages; return m.some((x) => x.type === "done" || x.type === "cancelled" || x.type === "error"); })()`, timeoutMs);
  const msgs = (await readWatch(page)).messages;
  const err = msgs.find((m) => m.type === "error");
  if (err) throw new Error("the spread worker failed");
  return msgs;
}

interface TraceEvent {
  name: string;
  ph: string;
  pid: number;
  tid: number;
  dur?: number;
  tdur?: number;
  args?: { name?: string };
}

/** The renderer main thread's tasks in a trace: wall time and time on the CPU, ms, longest wall first. */
function mainThreadTasks(events: TraceEvent[]): { wall: number; cpu: number }[] {
  const main = events.find((e) => e.name === "thread_name" && e.args?.name === "CrRendererMain");
  if (!main) return [];
  return events
    .filter((e) => e.pid === main.pid && e.tid === main.tid && e.name === "RunTask" && e.ph === "X" && e.dur !== undefined)
    .map((e) => ({ wall: e.dur! / 1000, cpu: (e.tdur ?? e.dur!) / 1000 }))
    .sort((a, b) => b.wall - a.wall);
}

const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length ? (s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2) : NaN;
};
const ms = (x: number | null | undefined) => (x === null || x === undefined || !Number.isFinite(x) ? "—" : `${x.toFixed(1)} ms`);

/** The measurements, in a browser against the started app. */
async function measure(browser: Browser, baseUrl: string) {
  const load = () => os.loadavg().map((x) => x.toFixed(2)).join(", ");
  const context = await browser.newContext({ baseURL: baseUrl, viewport: { width: 1280, height: 800 } });
  const page = await context.newPage();
  await page.addInitScript(INIT);
  await signInWithPassword(page, DEMO_PEOPLE.engineerA.email, DEMO_PASSWORD);
  await page.waitForURL(/\/chains$/);

  // the benchmark chain at 1,000 points, laid out, saved through the API
  const base = benchChain();
  const chain = { ...base, name: "Spread benchmark, 10 stages", analysis: { ...base.analysis, points: 1000 } };
  const at = tidyLayout(chain);
  const created = await page.request.post("/api/chains", { data: { name: chain.name, document: { ...chain, nodes: chain.nodes.map((n) => ({ ...n, position: at[n.id] })) } } });
  if (created.status() !== 201) throw new Error(`the benchmark chain was refused: ${created.status()} ${await created.text()}`);
  const id = ((await created.json()) as { chain: { id: string } }).chain.id;
  await page.goto(`/chains/${id}`);
  await page.getByTestId("workspace").waitFor();
  await until(page, `performance.getEntriesByType("mark").some((m) => m.name.startsWith("cw:plot:"))`, 60_000);
  // the last stage in the inspector, so its rf field is at hand during the run
  await page.getByTestId("card-g3").locator("div.truncate").first().click();
  const field = page.locator("#f-rf");
  await field.waitFor();
  await page.getByRole("tab", { name: "Spread" }).click();
  await page.getByTestId("spread-run").waitFor();

  // ---- 1. runs to the end: the worker's own time
  const worker1k: number[] = [];
  await startRun(page, 300); // warm-up (the worker's code compiled)
  await untilEnd(page);
  for (let i = 0; i < FULL_RUNS; i++) {
    await startRun(page, 1000);
    const msgs = await untilEnd(page);
    worker1k.push(msgs.find((m) => m.type === "done")!.ms!);
  }
  await startRun(page, 10_000);
  const msgs10k = await untilEnd(page);
  const worker10k = msgs10k.find((m) => m.type === "done")!.ms!;

  // ---- 2. a long run watched, typed into and cancelled
  // (0) the same page with nothing running, as long as (a) will take: what this machine's load alone does
  await watch(page, true);
  await page.waitForTimeout(3000);
  const idle = await readWatch(page);
  // (a) the run alone: the page only receives progress and partial results; traced, for each main-thread
  // task's time on the CPU beside its wall time (a busy machine stretches the second, not the first)
  const cdp = await context.newCDPSession(page);
  const traced: TraceEvent[] = [];
  cdp.on("Tracing.dataCollected", (e) => void traced.push(...(e.value as unknown as TraceEvent[])));
  const traceDone = new Promise<void>((resolve) => cdp.once("Tracing.tracingComplete", () => resolve()));
  await cdp.send("Tracing.start", { traceConfig: { includedCategories: ["toplevel", "disabled-by-default-devtools.timeline"] }, transferMode: "ReportEvents" });
  await watch(page, true);
  await startRun(page, WATCHED);
  const started = (await page.evaluate(`performance.now()`)) as number;
  const share = `(() => { const p = window.__cwSpread.messages.filter((m) => m.type === "progress").pop(); return p ? p.done / p.total : 0; })()`;
  await until(page, `${share} >= 0.3`, 300_000);
  const alone = await readWatch(page);
  await cdp.send("Tracing.end");
  await traceDone;
  const tasks = mainThreadTasks(traced);
  const aloneMs = ((await page.evaluate(`performance.now()`)) as number) - started;
  // (b) typing into rf while it runs: each keystroke is an edit (the workspace analyses and redraws)
  await watch(page, true);
  await field.click();
  await page.keyboard.press("End");
  for (let k = 0; k < KEYS; k++) {
    await page.keyboard.press(k % 2 ? "Backspace" : "0");
    await page.waitForTimeout(250);
  }
  await page.waitForTimeout(1500); // the edits' full analysis lands after the typing
  const typing = await readWatch(page);
  // (c) the cancel, clicked in the page so its time is the page's own
  await watch(page, true);
  if (typing.messages.some((m) => m.type === "done")) throw new Error(`the ${WATCHED}-build run ended before the cancel: raise --watched`);
  const cancelShare = (await page.evaluate(share)) as number;
  const clickAt = (await page.evaluate(`(() => { const t = performance.now(); document.querySelector('[data-testid="spread-cancel"]').click(); return t; })()`)) as number;
  const msgs = await untilEnd(page, 30_000);
  await page.getByTestId("spread-status").and(page.locator('[data-phase="cancelled"]')).waitFor({ timeout: 30_000 });
  const shownAt = (await page.evaluate(`performance.now()`)) as number;
  await page.waitForTimeout(300); // anything the worker still sends after its last word
  const w = await readWatch(page);
  await watch(page, false);
  const cancelledMsg = w.messages.find((m) => m.type === "cancelled")!;
  const afterClick = w.messages.filter((m) => m.t > clickAt);
  const lastAt = Math.max(...afterClick.map((m) => m.t), clickAt);
  const progressValues = [...alone.progress, ...typing.progress].filter((p) => p.t >= started && p.t <= clickAt).map((p) => p.v);
  const distinct = new Set(progressValues).size;
  const longestOf = (x: Watch) => Math.max(0, ...x.longTasks.map((t) => t.ms));
  const keyEvents = typing.events.filter((e) => e.name === "keydown");
  const partials = msgs.filter((m) => m.partial).length;
  const heaviest = (x: Watch) =>
    x.frames
      .sort((a, b) => b.ms - a.ms)
      .slice(0, 3)
      .map((f) => `${f.ms.toFixed(0)} ms (rendering ${f.render.toFixed(0)}, of it style and layout ${f.layout.toFixed(0)}) [${f.scripts.map((sc) => `${sc.what.trim()} ${sc.ms} ms`).join("; ") || "no script over 5 ms"}]`)
      .join(" | ") || "none";
  console.log(`\nSpread tab, 10-stage chain at 1,000 points, headless Chromium 1280×800 (load average ${load()})\n`);
  console.log("1. runs to the end, the worker's own time");
  console.log(`   1,000 builds   median ${ms(median(worker1k))} of ${worker1k.length} runs (${worker1k.map((x) => x.toFixed(0)).join(", ")} ms); target < 500 ms: ${median(worker1k) < 500 ? "met" : "NOT met"}`);
  console.log(`  10,000 builds   ${ms(worker10k)}`);
  console.log(`2. a ${WATCHED.toLocaleString("en")}-build run watched from the page, then cancelled`);
  const longestScript = (x: Watch) => Math.max(0, ...x.frames.flatMap((f) => f.scripts.map((sc) => sc.ms)));
  console.log(
    `   nothing running (3 s)      longest main-thread task ${ms(longestOf(idle))}; largest timer gap ${ms(idle.maxGap)} (${idle.gaps} over 50 ms): this machine's load alone`,
  );
  console.log(
    `   the run alone (to 30 %, ${(aloneMs / 1000).toFixed(1)} s)  longest script in a frame ${ms(longestScript(alone))} (Long Animation Frames, scripts of 5 ms or more)`,
  );
  const byCpu = [...tasks].sort((a, b) => b.cpu - a.cpu);
  console.log(
    `                              traced main-thread tasks: ${tasks.length}; longest by wall ${ms(tasks[0]?.wall)} (on the CPU ${ms(tasks[0]?.cpu)}); ` +
      `longest on the CPU ${ms(byCpu[0]?.cpu)}; tasks over 50 ms on the CPU: ${tasks.filter((t) => t.cpu > 50).length}; target < 50 ms on the CPU: ${(byCpu[0]?.cpu ?? 0) < 50 ? "met" : "NOT met"}`,
  );
  console.log(
    `                              longest main-thread task ${ms(longestOf(alone))} (Long Tasks API: ${alone.longTasks.length} of 50 ms or more); ` +
      `largest timer gap ${ms(alone.maxGap)} (${alone.gaps} over 50 ms); target < 50 ms: ${longestOf(alone) < 50 && alone.maxGap < 50 ? "met" : "NOT met"}`,
  );
  console.log(`                              longest frames: ${heaviest(alone)}`);
  console.log(`   progress bar               ${distinct} distinct values over ${progressValues.length} samples (${progressValues[0] ?? "—"} → ${progressValues[progressValues.length - 1] ?? "—"} %): ${distinct >= 3 ? "moves" : "DOES NOT MOVE"}; ${partials} partial results streamed in all`);
  console.log(
    `   keystrokes in rf (${typing.keys.length})       keydown → next frame median ${ms(median(typing.keys.map((k) => k.frame)))}, max ${ms(Math.max(...typing.keys.map((k) => k.frame)))}; ` +
      `input delay max ${ms(Math.max(...typing.keys.map((k) => k.delay)))}; Event Timing (input to next paint, reported from 16 ms): ${keyEvents.length ? `max ${ms(Math.max(...keyEvents.map((e) => e.ms)))}` : "none over 16 ms"}`,
  );
  console.log(`                              while typing and 1.5 s after: longest task ${ms(longestOf(typing))} (the edits' own analysis and redraw); longest frames: ${heaviest(typing)}`);
  console.log(
    `   cancel at ${(cancelShare * 100).toFixed(0)} %             click → the worker's last message ${ms(lastAt - clickAt)} (its "cancelled" at ${ms(cancelledMsg.t - clickAt)}; ${afterClick.filter((m) => m.type === "progress").length} progress messages after the click); ` +
      `→ shown ${ms(shownAt - clickAt)} (includes this script's polling); target < 100 ms: ${lastAt - clickAt < 100 ? "met" : "NOT met"}`,
  );
  mkdirSync(ARTIFACTS, { recursive: true });
  await page.screenshot({ path: path.join(ARTIFACTS, "bench-spread-ui.png") });
  writeFileSync(
    path.join(ARTIFACTS, "bench-spread-ui.json"),
    JSON.stringify({ when: new Date().toISOString(), load: os.loadavg(), worker1k, worker10k, alone, typing, cancel: w, cancelMs: lastAt - clickAt, progressValues }, null, 2),
  );
  await context.close();
}

const server = await startE2EServer(ARTIFACTS);
const browser = await chromium.launch({ executablePath: CHROMIUM_PATH, headless: true, args: CHROMIUM_FLAGS });
const failed = await measure(browser, server.baseUrl).then(
  () => false,
  (e: unknown) => (console.error(e), true),
);
await browser.close();
await server.stop();
process.exitCode = failed ? 1 : 0;
