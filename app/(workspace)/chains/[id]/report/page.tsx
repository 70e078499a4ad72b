import type { Metadata } from "next";
import Link from "next/link";
import { listReviews } from "@/db/queries/reviews";
import { outputsOrReasons } from "@/lib/api/outputs";
import { pageChain } from "@/lib/auth/guard";
import { DesignReport, type ReviewLine } from "@/components/outputs/design-report";
import { PrintButton } from "@/components/outputs/print-button";
import "@/components/outputs/report.css";

export const metadata: Metadata = { title: "Design report" };

type Props = { params: Promise<{ id: string }>; searchParams: Promise<{ paper?: string }> };

const when = (d: Date | null) => (d ? d.toISOString().slice(0, 16).replace("T", " ") : null);

/** /chains/:id/report: the print-ready design report (A4, or Letter with ?paper=letter). */
export default async function ReportPage({ params, searchParams }: Props) {
  const { id } = await params;
  const paper = (await searchParams).paper === "letter" ? "letter" : "a4";
  const rights = await pageChain("export", id, `/chains/${id}/report`);
  const row = rights.chain;
  const made = outputsOrReasons(row);
  const reviews: ReviewLine[] = listReviews(id).map((r) => ({
    reviewer: r.reviewer.name ?? "a reviewer",
    requestedBy: r.requestedBy?.name ?? null,
    decision: r.decision,
    askedRevision: r.requestedRevision.number,
    decidedRevision: r.decidedRevision?.number ?? null,
    decidedAt: when(r.decidedAt),
    note: r.note,
    closed: r.closedReason,
  }));
  return (
    <div className="flex flex-col gap-4">
      <nav className="report-screen-only flex flex-wrap items-center gap-3 text-sm" aria-label="Report">
        <Link href={`/chains/${id}`}>← Back to the chain</Link>
        <Link href={`/chains/${id}/outputs`}>Outputs</Link>
        <span className="text-graphite-500">Paper:</span>
        <Link href={`/chains/${id}/report`} aria-current={paper === "a4" ? "page" : undefined} className={paper === "a4" ? "font-semibold" : ""}>
          A4
        </Link>
        <Link href={`/chains/${id}/report?paper=letter`} aria-current={paper === "letter" ? "page" : undefined} className={paper === "letter" ? "font-semibold" : ""}>
          Letter
        </Link>
        <PrintButton />
      </nav>
      {made.ok ? (
        <DesignReport
          chainId={id}
          chain={made.outputs.chain}
          result={made.outputs.result}
          revision={made.outputs.revision}
          version={row.version}
          reviewState={row.reviewState}
          reviews={reviews}
          generatedAt={when(new Date())!}
          paper={paper}
        />
      ) : (
        <NotComplete reasons={made.reasons} name={row.name} />
      )}
    </div>
  );
}

function NotComplete({ reasons, name }: { reasons: string[]; name: string }) {
  return (
    <div data-testid="not-complete">
      <h1 className="text-xl font-semibold">{name}: no report yet</h1>
      <p className="mt-1">Reports, bills of materials and scaling constants are made from complete chains. What is still missing:</p>
      <ul className="mt-2 list-disc pl-5 text-sm">
        {reasons.slice(0, 20).map((r) => (
          <li key={r} className="num">
            {r}
          </li>
        ))}
      </ul>
    </div>
  );
}
