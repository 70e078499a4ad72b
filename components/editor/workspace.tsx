"use client";
/**
 * The chain workspace: shelf, canvas and inspector side by side, with the response, findings and
 * headroom in a dock under the canvas. It owns the per-chain store, starts the live analysis and the
 * autosave, and handles the keyboard commands and the conflict choice.
 */
import { useCallback, useEffect, useRef, useState } from "react";
import { useRouter } from "next/navigation";
import dynamic from "next/dynamic";
import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import { isSourceKind } from "@/lib/chain/types";
import { ReactFlowProvider, useReactFlow, useStoreApi } from "@xyflow/react";
import { Notice } from "@/components/ui/notice";
import { SafetyCaution } from "@/components/safety-caution";
import { ResponsePlot } from "@/components/plots/response-plot";
import { DockLoading } from "./dock-loading";
import { createEditorStore, type EditorStore } from "@/lib/store/editor-store";
import { EditorProvider, useEditor, useEditorActions, useEditorStoreApi } from "@/lib/store/editor-context";
import { startBrowserAnalysis } from "@/lib/store/analysis-driver";
import { startAutosave, type Autosave } from "@/lib/store/autosave";
import { toDraftDoc } from "@/lib/store/draft";
import { ApiFailure, createChain, fetchChain, saveChain, type ChainDto } from "@/lib/api/client/chains";
import { ChainCanvas, FIT_OPTIONS, initialFlow, MAX_ZOOM, MIN_ZOOM } from "./chain-canvas";
import { Shelf } from "./shelf";
import { Inspector } from "./inspector";
import { OutputsLinks } from "@/components/outputs/outputs-link";
import { SaveIndicator } from "./save-indicator";
import { commandFor, isTypingTarget, KEY_TABLE, type Command } from "./shortcuts";
import { LiveProbe } from "./live-probe";
import { TeamTools } from "@/components/review/team-tools";

// The dock's other tabs load with their first opening: none of them is on the first screen, and their
// code (tables, the spread's worker client, the waveform tools) kept out of the first script is less to
// fetch, compile and run before a chain answers. No server rendering: a hidden tab has nothing to show.
const ChecksPanel = dynamic(() => import("@/components/checks/checks-panel").then((m) => m.ChecksPanel), { ssr: false, loading: DockLoading });
const HeadroomTable = dynamic(() => import("@/components/checks/headroom-table").then((m) => m.HeadroomTable), { ssr: false, loading: DockLoading });
const NoiseBudgetPanel = dynamic(() => import("@/components/spread/noise-budget-panel").then((m) => m.NoiseBudgetPanel), { ssr: false, loading: DockLoading });
const SpreadPanel = dynamic(() => import("@/components/spread/spread-panel").then((m) => m.SpreadPanel), { ssr: false, loading: DockLoading });
const GainPlanPanel = dynamic(() => import("./gain-plan-panel").then((m) => m.GainPlanPanel), { ssr: false, loading: DockLoading });
const WaveformPanel = dynamic(() => import("@/components/waveform/waveform-panel").then((m) => m.WaveformPanel), { ssr: false, loading: DockLoading });

export interface WorkspaceProps {
  chain: ChainDto;
}

export function Workspace({ chain }: WorkspaceProps) {
  const [queryClient] = useState(() => new QueryClient());
  const [store] = useState<EditorStore>(() =>
    createEditorStore({ doc: toDraftDoc(chain.document), chainId: chain.id, version: chain.version, readOnly: !chain.actions.includes("edit") }),
  );
  const [flow] = useState(() => initialFlow(store.getState().doc, store.getState().selected));
  return (
    <QueryClientProvider client={queryClient}>
      <EditorProvider store={store}>
        <ReactFlowProvider initialNodes={flow.nodes} initialEdges={flow.edges} fitView initialFitViewOptions={FIT_OPTIONS} initialMinZoom={MIN_ZOOM} initialMaxZoom={MAX_ZOOM}>
          <WorkspaceBody role={chain.role} />
        </ReactFlowProvider>
      </EditorProvider>
    </QueryClientProvider>
  );
}

/** the longest the first analysis waits for React Flow to show the cards */
const FIRST_ANALYSIS_WAIT_MS = 400;

type DockTab = "response" | "findings" | "headroom" | "noise" | "spread" | "gainPlan" | "waveforms";

function WorkspaceBody({ role }: { role: ChainDto["role"] }) {
  const store = useEditorStoreApi();
  const actions = useEditorActions();
  const rf = useReactFlow();
  const autosave = useRef<Autosave | null>(null);
  const [tab, setTab] = useState<DockTab>("response");
  const [keysOpen, setKeysOpen] = useState(false);

  const flowStore = useStoreApi();
  useEffect(() => {
    // The first analysis waits for the cards. React Flow keeps them hidden until it has measured them and
    // fitted them into view, which takes a resize report and two renders after hydration; started at once,
    // the analysis and the first plot ran ahead of those and the cards showed only after the plot. So the
    // analysis starts in the task after the frame that shows the fitted cards (or after FIRST_ANALYSIS_WAIT_MS
    // if React Flow never reports them measured).
    let driver: ReturnType<typeof startBrowserAnalysis> | null = null;
    let timer: ReturnType<typeof setTimeout> | null = null;
    let frame = 0;
    let started = false;
    const begin = () => {
      if (started) return;
      started = true;
      unsubscribe();
      clearTimeout(fallback);
      frame = requestAnimationFrame(() => {
        timer = setTimeout(() => (driver = startBrowserAnalysis(store)), 0);
      });
    };
    const cardsShown = () => flowStore.getState().nodesInitialized || flowStore.getState().nodes.length === 0;
    const unsubscribe = flowStore.subscribe(() => void (cardsShown() && begin()));
    const fallback = setTimeout(begin, FIRST_ANALYSIS_WAIT_MS);
    if (cardsShown()) begin();
    const auto = startAutosave(store, async ({ id, baseVersion, document }) => {
      const saved = await saveChain({ id, baseVersion, document });
      return { version: saved.version };
    });
    autosave.current = auto;
    const beforeUnload = (e: BeforeUnloadEvent) => {
      const s = store.getState().save;
      if (s === "unsaved" || s === "saving" || s === "conflict" || s === "error") e.preventDefault();
    };
    window.addEventListener("beforeunload", beforeUnload);
    return () => {
      unsubscribe();
      clearTimeout(fallback);
      cancelAnimationFrame(frame);
      if (timer) clearTimeout(timer);
      driver?.stop();
      auto.stop();
      window.removeEventListener("beforeunload", beforeUnload);
    };
  }, [store, flowStore]);

  const focusNode = useCallback(
    (id: string) => {
      // Bring the node into the middle of the view at the present zoom, so the chain around it stays in sight.
      const zoom = rf.getZoom();
      void rf.fitView({ nodes: [{ id }], duration: 250, minZoom: zoom, maxZoom: zoom });
    },
    [rf],
  );

  const run = useCallback(
    (cmd: Command) => {
      switch (cmd.type) {
        case "undo": return actions.undo();
        case "redo": return actions.redo();
        case "delete": return actions.deleteSelection();
        case "duplicate": return actions.duplicateSelection();
        case "copy": return void actions.copySelection();
        case "cut": return actions.cutSelection();
        case "paste": return actions.paste();
        case "selectAll": return actions.selectAll();
        case "deselect": return actions.select([]);
        case "connect": return void actions.connectSelected();
        case "save": return void autosave.current?.flush();
        case "fit": return void rf.fitView({ duration: 200, ...FIT_OPTIONS });
        case "tidy":
          actions.tidy();
          setTimeout(() => void rf.fitView({ duration: 200, ...FIT_OPTIONS }), 30);
          return;
        case "add": {
          const s = store.getState();
          actions.addNode(cmd.kind, undefined, { after: s.selected.length === 1 ? s.selected[0] : undefined });
          return;
        }
      }
    },
    [actions, rf, store],
  );

  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      if (e.defaultPrevented || isTypingTarget(e.target)) return;
      const cmd = commandFor(e);
      if (!cmd) return;
      // Copy stays with the browser when the user has selected text on the page.
      if (cmd.type === "copy" && window.getSelection()?.toString()) return;
      e.preventDefault();
      run(cmd);
    };
    document.addEventListener("keydown", onKey);
    return () => document.removeEventListener("keydown", onKey);
  }, [run]);

  return (
    <div data-workspace className="flex h-[calc(100dvh-57px)] min-h-[600px] flex-col bg-paper" data-testid="workspace">
      <WorkspaceBar role={role} run={run} keysOpen={keysOpen} setKeysOpen={setKeysOpen} />
      <TeamTools />
      <Banners />
      <div className="grid min-h-0 flex-1 grid-cols-[156px_minmax(0,1fr)_316px]">
        <aside className="min-h-0 overflow-y-auto border-r border-paper-rule bg-paper-sunk/40">
          <Shelf />
        </aside>
        <div className="grid min-h-0 grid-rows-[minmax(0,1fr)_316px]">
          <div className="relative min-h-0">
            <ChainCanvas />
            <Notices />
          </div>
          <Dock tab={tab} setTab={setTab} focusNode={focusNode} />
        </div>
        <aside className="min-h-0 overflow-y-auto border-l border-paper-rule bg-paper-raised" aria-label="Inspector">
          <Inspector />
        </aside>
      </div>
      <LiveProbe />
    </div>
  );
}

function ToolButton({ label, keys, onClick, disabled }: { label: string; keys?: string; onClick: () => void; disabled?: boolean }) {
  return (
    <button
      type="button"
      onClick={onClick}
      disabled={disabled}
      title={keys ? `${label} (${keys})` : label}
      className="rounded-card px-2 py-1 text-[12.5px] text-graphite-900 hover:bg-paper-sunk disabled:cursor-not-allowed disabled:text-graphite-300"
    >
      {label}
    </button>
  );
}

const ROLE_WORDS: Record<string, string> = { owner: "owner", editor: "editor", reviewer: "reviewer", viewer: "viewer" };

function WorkspaceBar({ role, run, keysOpen, setKeysOpen }: { role: ChainDto["role"]; run: (c: Command) => void; keysOpen: boolean; setKeysOpen: (o: boolean) => void }) {
  const name = useEditor((s) => s.doc.name);
  const readOnly = useEditor((s) => s.readOnly);
  const canUndo = useEditor((s) => s.past.length > 0);
  const canRedo = useEditor((s) => s.future.length > 0);
  const hasSel = useEditor((s) => s.selected.length > 0 || s.selectedEdges.length > 0);
  // One string, so the bar re-renders only when a count changes.
  const counts = useEditor((s) => {
    const stages = Object.values(s.live?.stageById ?? {}).map((x) => x.status);
    const adcs = Object.values(s.live?.adcById ?? {}).map((x) => x.status);
    const n = (list: (string | undefined)[], st: string) => list.filter((x) => x === st).length;
    return [n(stages, "clip"), n(adcs, "clip"), n(stages, "tight") + n(adcs, "tight")].join("/");
  });
  const [clips, adcClips, tights] = counts.split("/").map(Number);
  const plural = (k: number, one: string, many: string) => `${k} ${k === 1 ? one : many}`;
  const worst = [
    clips > 0 ? plural(clips, "stage hits a rail", "stages hit a rail") : null,
    adcClips > 0 ? plural(adcClips, "converter over range", "converters over range") : null,
  ].filter(Boolean);
  return (
    <div className="flex items-center gap-3 border-b border-paper-rule bg-paper-raised px-3 py-1.5">
      <h1 className="min-w-0 max-w-[22rem] truncate text-[15px] font-semibold text-graphite-950" data-testid="chain-name">
        {name}
      </h1>
      <SaveIndicator />
      {readOnly && role && <span className="rounded-card border border-paper-rule px-1.5 py-0.5 text-[11.5px] text-graphite-700">you are a {ROLE_WORDS[role] ?? role}: viewing only</span>}
      <span className="text-[12.5px] text-graphite-700" data-testid="headline">
        {worst.length > 0 ? (
          <span><span aria-hidden className="text-status-clip">■ </span>{worst.join(" · ")}</span>
        ) : tights > 0 ? (
          <span><span aria-hidden className="text-status-tight">▲ </span>{tights} with little margin</span>
        ) : null}
      </span>
      <OutputsLinks />
      <div className="ml-auto flex items-center gap-0.5" role="toolbar" aria-label="Canvas commands">
        {!readOnly && (
          <>
            <ToolButton label="Undo" keys="Ctrl Z" onClick={() => run({ type: "undo" })} disabled={!canUndo} />
            <ToolButton label="Redo" keys="Ctrl Shift Z" onClick={() => run({ type: "redo" })} disabled={!canRedo} />
            <ToolButton label="Duplicate" keys="Ctrl D" onClick={() => run({ type: "duplicate" })} disabled={!hasSel} />
            <ToolButton label="Delete" keys="Delete" onClick={() => run({ type: "delete" })} disabled={!hasSel} />
            <ToolButton label="Copy" keys="Ctrl C" onClick={() => run({ type: "copy" })} disabled={!hasSel} />
            <ToolButton label="Paste" keys="Ctrl V" onClick={() => run({ type: "paste" })} />
            <ToolButton label="Tidy" keys="T" onClick={() => run({ type: "tidy" })} />
          </>
        )}
        <ToolButton label="Fit" keys="F" onClick={() => run({ type: "fit" })} />
        <div className="relative">
          <ToolButton label="Keys" onClick={() => setKeysOpen(!keysOpen)} />
          {keysOpen && (
            <div className="absolute right-0 top-8 z-20 w-80 rounded-card border border-paper-rule bg-paper-raised p-3 shadow-card" role="dialog" aria-label="Keyboard commands">
              <table className="w-full text-[12px]">
                <tbody>
                  {KEY_TABLE.map((k) => (
                    <tr key={k.keys}>
                      <td className="num whitespace-nowrap py-0.5 pr-2 align-top text-graphite-950">{k.keys}</td>
                      <td className="py-0.5 text-graphite-700">{k.what}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          )}
        </div>
      </div>
    </div>
  );
}

function Banners() {
  const safety = useEditor((s) => (s.doc.nodes.find((n) => isSourceKind(n.kind))?.params as { safety?: string } | undefined)?.safety as string | undefined);
  const conflict = useEditor((s) => s.save === "conflict");
  return (
    <>
      {safety && safety !== "low-voltage" && (
        <Notice tone="caution" title={safety === "mains-connected" ? "Mains-connected source" : "Source connected to a person"} className="mx-3 mt-2 py-2">
          <div data-testid="safety-caution">
            <SafetyCaution />
          </div>
        </Notice>
      )}
      {conflict && <ConflictBar />}
    </>
  );
}

function ConflictBar() {
  const store = useEditorStoreApi();
  const actions = useEditorActions();
  const router = useRouter();
  const serverVersion = useEditor((s) => s.conflict?.serverVersion);
  const [busy, setBusy] = useState<null | "reload" | "copy">(null);
  const [problem, setProblem] = useState<string | null>(null);
  const reload = async () => {
    setBusy("reload");
    setProblem(null);
    try {
      const c = await fetchChain(store.getState().chainId!);
      actions.loadDoc(toDraftDoc(c.document), c.version);
    } catch (e) {
      setProblem(e instanceof ApiFailure ? e.message : String(e));
    } finally {
      setBusy(null);
    }
  };
  const keepCopy = async () => {
    setBusy("copy");
    setProblem(null);
    try {
      const doc = store.getState().doc;
      const name = `${doc.name} (my copy)`.slice(0, 200);
      const c = await createChain({ name, document: { ...doc, name } });
      actions.switchChain(c.id, c.version, toDraftDoc(c.document ?? { ...doc, name }));
      router.replace(`/chains/${c.id}`);
    } catch (e) {
      setProblem(e instanceof ApiFailure ? e.message : String(e));
    } finally {
      setBusy(null);
    }
  };
  return (
    <Notice tone="problem" title="Someone else saved this chain" className="mx-3 mt-2 py-2">
      <div className="flex flex-wrap items-center gap-3" data-testid="conflict">
        <span>
          The chain is now at version {serverVersion ?? "?"}, newer than the one your edits started from. Your edits are kept here but
          not saved. Take their version, or keep yours as a new chain.
        </span>
        <span className="flex gap-2">
          <button type="button" onClick={reload} disabled={busy !== null} className="rounded-card border border-paper-rule bg-paper-raised px-2.5 py-1 text-[12.5px] font-medium hover:bg-paper-sunk">
            {busy === "reload" ? "Loading…" : "Load their version"}
          </button>
          <button type="button" onClick={keepCopy} disabled={busy !== null} className="rounded-card bg-accent-700 px-2.5 py-1 text-[12.5px] font-medium text-white hover:bg-accent-800">
            {busy === "copy" ? "Saving a copy…" : "Keep mine as a copy"}
          </button>
        </span>
        {problem && <span className="text-status-clip">■ {problem}</span>}
      </div>
    </Notice>
  );
}

function Notices() {
  const notice = useEditor((s) => s.notice);
  const actions = useEditorActions();
  useEffect(() => {
    if (!notice) return;
    const t = setTimeout(() => actions.setNotice(null), 4000);
    return () => clearTimeout(t);
  }, [notice, actions]);
  if (!notice) return null;
  return (
    <div role="status" className="absolute left-1/2 top-3 z-10 -translate-x-1/2 rounded-card border border-paper-rule bg-paper-raised px-3 py-1.5 text-[12.5px] text-graphite-900 shadow-card" data-testid="notice">
      {notice}
    </div>
  );
}

function Dock({ tab, setTab, focusNode }: { tab: DockTab; setTab: (t: DockTab) => void; focusNode: (id: string) => void }) {
  const findings = useEditor((s) => s.live?.warnings.length ?? 0);
  const tabs: { id: DockTab; label: string }[] = [
    { id: "response", label: "Response" },
    { id: "findings", label: `Findings${findings ? ` (${findings})` : ""}` },
    { id: "headroom", label: "Headroom" },
    { id: "noise", label: "Noise budget" },
    { id: "spread", label: "Spread" },
    { id: "gainPlan", label: "Gain plan" },
    { id: "waveforms", label: "Waveforms" },
  ];
  const chainId = useEditor((s) => s.chainId);
  // the spread and waveform tabs mount on their first opening and are then kept (a run survives switching)
  const [opened, setOpened] = useState({ spread: false, waveforms: false });
  if ((tab === "spread" || tab === "waveforms") && !opened[tab]) setOpened({ ...opened, [tab]: true });
  return (
    <section className="flex min-h-0 flex-col border-t border-paper-rule bg-paper-raised">
      <div role="tablist" aria-label="Analysis views" className="flex gap-0.5 border-b border-paper-rule px-2 pt-1">
        {tabs.map((t) => (
          <button
            key={t.id}
            role="tab"
            type="button"
            id={`dock-tab-${t.id}`}
            aria-selected={tab === t.id}
            aria-controls={`dock-panel-${t.id}`}
            onClick={() => setTab(t.id)}
            className={`rounded-t-card px-3 py-1 text-[12.5px] ${tab === t.id ? "border border-b-0 border-paper-rule bg-paper-raised font-medium text-graphite-950" : "text-graphite-500 hover:text-graphite-900"}`}
          >
            {t.label}
          </button>
        ))}
      </div>
      {/* The plot stays mounted while hidden so switching tabs does not reload or redraw it. */}
      <div id="dock-panel-response" role="tabpanel" aria-labelledby="dock-tab-response" hidden={tab !== "response"} className="min-h-0 flex-1">
        <ResponsePlot visible={tab === "response"} />
      </div>
      {tab === "findings" && (
        <div id="dock-panel-findings" role="tabpanel" aria-labelledby="dock-tab-findings" className="min-h-0 flex-1">
          <ChecksPanel onFocusNode={focusNode} />
        </div>
      )}
      {tab === "headroom" && (
        <div id="dock-panel-headroom" role="tabpanel" aria-labelledby="dock-tab-headroom" className="min-h-0 flex-1">
          <HeadroomTable onFocusNode={focusNode} />
        </div>
      )}
      {tab === "noise" && (
        <div id="dock-panel-noise" role="tabpanel" aria-labelledby="dock-tab-noise" className="min-h-0 flex-1">
          <NoiseBudgetPanel />
        </div>
      )}
      {/* mounted on first opening, then kept mounted while hidden, so a run in progress goes on and its result stays */}
      {opened.spread && (
        <div id="dock-panel-spread" role="tabpanel" aria-labelledby="dock-tab-spread" hidden={tab !== "spread"} className="min-h-0 flex-1">
          <SpreadPanel />
        </div>
      )}
      {tab === "gainPlan" && (
        <div id="dock-panel-gainPlan" role="tabpanel" aria-labelledby="dock-tab-gainPlan" className="min-h-0 flex-1">
          <GainPlanPanel />
        </div>
      )}
      {/* mounted on first opening (it starts a worker), then kept so a run survives switching tabs */}
      {opened.waveforms && (
        <div id="dock-panel-waveforms" role="tabpanel" aria-labelledby="dock-tab-waveforms" hidden={tab !== "waveforms"} className="min-h-0 flex-1">
          <WaveformPanel chainId={chainId} visible={tab === "waveforms"} />
        </div>
      )}
    </section>
  );
}
