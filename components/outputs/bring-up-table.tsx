/**
 * The bring-up sheet as a table (outputs page and design report): per test point the DC nominal and the
 * interval offsets and bias currents allow, the AC amplitude and phase at each test frequency and, when
 * the sheet carries its spread (lib/handoff/bring-up-spread.ts), what the builds within the part
 * tolerances reached, with the builds, seed and tolerances said under the table. Numbers are the
 * engine's as lib/handoff hands them over.
 */
import type { BringUpSheet, Range } from "@/lib/handoff";
import { formatQuantity } from "@/lib/units";
import { fmt, fmtVolts } from "@/components/editor/format";
import { ReportTable, td, tdText } from "./report-table";

const v = (x: number | null | undefined) => (x === null || x === undefined ? "—" : fmtVolts(x));
const deg = (x: number | null) => (x === null ? "—" : `${x.toFixed(1).replace("-", "−")}°`);
/**
 * Digits for a range: four, or more when the range is narrow against its level (at most seven), so its
 * two ends differ where the builds did: a 2.5 V level that moves by 300 µV reads 2.49985 V … 2.50015 V.
 */
export function rangeDigits(r: Range): number {
  const level = Math.max(Math.abs(r.min), Math.abs(r.max));
  const width = r.max - r.min;
  if (!(width > 0) || !(level > 0)) return 4;
  return Math.min(7, Math.max(4, Math.ceil(Math.log10(level / width)) + 2));
}

export const rangeText = (r: Range | null, unbounded: string) => {
  if (!r) return unbounded;
  const d = rangeDigits(r);
  return `${fmt(r.min, "volt", d)} … ${fmt(r.max, "volt", d)}`;
};
const pct = (t: number) => `${Number((t * 100).toPrecision(3))} %`;

export function spreadNote(spread: NonNullable<BringUpSheet["spread"]>): string {
  const own = spread.tolerances.overrides;
  return (
    `Spread from tolerances: ${spread.trials} builds (seed ${spread.seed}), each resistor and capacitor drawn uniformly within its tolerance ` +
    `(resistors ±${pct(spread.tolerances.resistor)}, capacitors ±${pct(spread.tolerances.capacitor)}` +
    `${own ? `, ${own} part${own === 1 ? "" : "s"} with ${own === 1 ? "its" : "their"} own` : ""}; ${spread.parts} part${spread.parts === 1 ? "" : "s"} vary). ` +
    `"DC over the builds" joins each build's DC interval; the AC range is the amplitude the builds reached. ` +
    `Ranges from ${spread.trials} builds are what those builds reached, not guaranteed bounds.`
  );
}

export function BringUpTable({ sheet }: { sheet: BringUpSheet }) {
  const { spread } = sheet;
  const head = ["Point", "Where", "DC nominal", "DC spread"];
  if (spread) head.push(`DC over the ${spread.trials} builds`);
  head.push(...sheet.frequencies.map((f) => `at ${formatQuantity(f, "hertz")}`));
  return (
    <ReportTable
      head={head}
      testId="bring-up-table"
      wide
      caption={spread ? <span data-testid="bring-up-spread-note">{spreadNote(spread)}</span> : undefined}
    >
      {sheet.points.map((tp, j) => {
        const s = spread?.points[j];
        return (
          <tr key={tp.tp} className="report-keep">
            <td className={td}>{tp.tp}</td>
            <td className={tdText}>{tp.where}</td>
            <td className={td}>{v(tp.dcNominal)}</td>
            <td className={td} title={tp.dcInterval ? `${tp.dcInterval.min} V to ${tp.dcInterval.max} V` : undefined}>
              {tp.dcInterval ? `± ${v((tp.dcInterval.max - tp.dcInterval.min) / 2)}` : "unbounded"}
            </td>
            {s && (
              <td className={td} data-testid="spread-dc" title={s.dcInterval ? `${s.dcInterval.min} V to ${s.dcInterval.max} V` : undefined}>
                {rangeText(s.dcInterval, "unbounded")}
              </td>
            )}
            {tp.ac.map((a, k) => (
              <td key={a.f} className={td}>
                {a.amplitude === null ? "—" : `${fmtVolts(a.amplitude)} pk, ${deg(a.phaseDeg)}`}
                {s && <span className="block text-graphite-500">{rangeText(s.amplitude[k], "—")}</span>}
              </td>
            ))}
          </tr>
        );
      })}
    </ReportTable>
  );
}
