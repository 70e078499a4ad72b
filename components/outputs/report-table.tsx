/**
 * The one table markup of the hand-off pages (design report, outputs page): a header row of column
 * names and the caller's body rows, with the cell classes every table shares. Plain server markup.
 */
import type { ReactNode } from "react";

export const th = "border-b border-paper-rule px-1.5 py-1 text-left font-medium text-graphite-700";
/** a number cell (tabular figures); `text` is the same for words */
export const td = "num border-b border-paper-rule/60 px-1.5 py-0.5 align-top text-graphite-900";
export const tdText = `${td} font-sans`;

interface ReportTableProps {
  head: ReactNode[];
  children: ReactNode;
  testId?: string;
  /** the full width of the page */
  wide?: boolean;
  className?: string;
  /** said under the table (how its numbers were made) */
  caption?: ReactNode;
}

export function ReportTable({ head, children, testId, wide = false, className = "", caption }: ReportTableProps) {
  return (
    <table className={`${wide ? "w-full " : ""}border-collapse text-[11.5px] ${className}`.trim()} data-testid={testId}>
      {caption && <caption className="caption-bottom pt-1 text-left text-[11px] text-graphite-500">{caption}</caption>}
      <thead>
        <tr>
          {head.map((h, k) => (
            <th key={k} scope="col" className={th}>
              {h}
            </th>
          ))}
        </tr>
      </thead>
      <tbody>{children}</tbody>
    </table>
  );
}
