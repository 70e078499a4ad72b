import type { Metadata } from "next";
import Link from "next/link";
import { BringUpTable } from "@/components/outputs/bring-up-table";
import { ValidationError } from "@/lib/api/errors";
import { outputsOrReasons, readTestFrequencies } from "@/lib/api/outputs";
import { pageChain } from "@/lib/auth/guard";
import { buildBringUpSheet, buildFirmwareScaling, defaultTestFrequencies, scalingHeader, withSpread, type FirmwareScaling } from "@/lib/handoff";

export const metadata: Metadata = { title: "Outputs" };

type Props = { params: Promise<{ id: string }>; searchParams: Promise<{ f?: string }> };

/** /chains/:id/outputs: every hand-off of the chain, to read here and to download. */
export default async function OutputsPage({ params, searchParams }: Props) {
  const { id } = await params;
  const fText = (await searchParams).f ?? "";
  const rights = await pageChain("export", id, `/chains/${id}/outputs`);
  const row = rights.chain;
  const made = outputsOrReasons(row);
  const api = `/api/chains/${id}`;
  const a = (href: string, text: string) => (
    <li>
      <a href={href}>{text}</a>
    </li>
  );
  let freqs: number[] = [];
  let freqProblem: string | null = null;
  if (made.ok) {
    try {
      freqs = readTestFrequencies(fText, made.outputs.chain);
    } catch (e) {
      if (!(e instanceof ValidationError)) throw e;
      freqProblem = e.errors.map((x) => `${x.path}: ${x.message}`).join("; ");
      freqs = defaultTestFrequencies(made.outputs.chain);
    }
  }
  const fQuery = fText.trim() ? `&f=${encodeURIComponent(fText)}` : "";
  return (
    <div className="flex flex-col gap-5" data-testid="outputs-page">
      <p className="text-sm">
        <Link href={`/chains/${id}`}>← Back to the chain</Link>
      </p>
      <h1 className="text-2xl font-semibold tracking-tight text-graphite-950">Outputs of {row.name}</h1>

      <section aria-labelledby="o-share" className="flex flex-col gap-1 text-sm">
        <h2 id="o-share" className="text-[15px] font-semibold">
          Share and exchange
        </h2>
        <ul className="list-disc pl-5">
          {a(`/chains/${id}/report`, "Design report (print or save as PDF; A4 or Letter)")}
          {a(`${api}/export`, "Chain file (JSON, for import elsewhere)")}
          <li>
            Read-only link for your team: <code className="num" data-testid="read-only-link">/chains/{id}/view</code> (opens for signed-in people who
            may see this chain; nobody can edit through it)
          </li>
          <li>
            <Link href="/chains/import">Import a chain file</Link>
          </li>
        </ul>
      </section>

      {!made.ok ? (
        <section className="text-sm" data-testid="not-complete">
          <p>The chain is not complete yet, so there is no bill of materials, bring-up sheet or scaling. What is still missing:</p>
          <ul className="mt-1 list-disc pl-5">
            {made.reasons.slice(0, 20).map((r) => (
              <li key={r} className="num">
                {r}
              </li>
            ))}
          </ul>
        </section>
      ) : (
        <>
          <section aria-labelledby="o-files" className="text-sm">
            <h2 id="o-files" className="text-[15px] font-semibold">
              Downloads
            </h2>
            <ul className="list-disc pl-5">
              {a(`${api}/outputs/bom`, "Bill of materials, one line per part (CSV)")}
              {a(`${api}/outputs/bom?layout=grouped`, "Bill of materials grouped by value (CSV)")}
              {a(`${api}/outputs/bring-up?format=csv${fQuery}`, "Bring-up sheet at the frequencies below (CSV)")}
              {a(`${api}/outputs/plot-data?table=response`, "Response of every stage (CSV)")}
              {a(`${api}/outputs/plot-data?table=noise`, "Output noise density (CSV)")}
              {a(`${api}/outputs/firmware?format=json`, "Converter scaling (JSON)")}
              {a(`${api}/outputs/firmware?format=h`, "Converter scaling (C header)")}
            </ul>
          </section>

          <section aria-labelledby="o-bringup" className="flex flex-col gap-2 text-sm">
            <h2 id="o-bringup" className="text-[15px] font-semibold">
              Bring-up sheet
            </h2>
            <form method="get" className="flex flex-wrap items-center gap-2">
              <label htmlFor="o-f">Test frequencies</label>
              <input id="o-f" name="f" defaultValue={fText} placeholder={defaultTestFrequencies(made.outputs.chain).join(", ")} className="num w-64 rounded-card border border-paper-rule bg-paper-raised px-2 py-1" />
              <button type="submit" className="rounded-card border border-paper-rule bg-paper-raised px-2.5 py-1 hover:bg-paper-sunk">
                Recompute
              </button>
              <span className="text-graphite-500">hertz, separated by commas (2, 63, 1k); up to 12</span>
            </form>
            {freqProblem && (
              <p role="alert" className="text-status-clip">
                {freqProblem}; showing the default frequencies.
              </p>
            )}
            <BringUpTable sheet={withSpread(made.outputs.chain, buildBringUpSheet(made.outputs.chain, made.outputs.result, freqs))} />
          </section>

          <section aria-labelledby="o-fw" className="flex flex-col gap-2 text-sm">
            <h2 id="o-fw" className="text-[15px] font-semibold">
              Converter scaling (C header)
            </h2>
            <pre className="num overflow-auto rounded-card border border-paper-rule bg-paper-raised p-2 text-[11.5px]" data-testid="scaling-header">
              {scalingHeader(
                buildFirmwareScaling(made.outputs.chain, made.outputs.result).flatMap((r): FirmwareScaling[] => (r.ok ? [r.scaling] : [])),
                made.outputs.revision,
              )}
            </pre>
          </section>
        </>
      )}
    </div>
  );
}
