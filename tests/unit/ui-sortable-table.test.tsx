// @vitest-environment jsdom
import { afterEach, describe, expect, it } from "vitest";
import { useState } from "react";
import { cleanup, fireEvent, render, screen, within } from "@testing-library/react";
import { createColumnHelper, getCoreRowModel, getSortedRowModel, useReactTable, type SortingState } from "@tanstack/react-table";
import { SortableTable } from "@/components/ui/sortable-table";

afterEach(cleanup);

interface Row {
  name: string;
  gain: number;
}
const col = createColumnHelper<Row>();
const columns = [col.accessor("name", { header: "Name" }), col.accessor("gain", { header: "Gain" }), col.display({ id: "commands", header: () => <span>Commands</span>, cell: () => "…" })];

function Harness({ data }: { data: Row[] }) {
  const [sorting, setSorting] = useState<SortingState>([{ id: "name", desc: false }]);
  // eslint-disable-next-line react-hooks/incompatible-library -- the table object is mutable by design; no React Compiler in this build
  const table = useReactTable({ data, columns, state: { sorting }, onSortingChange: setSorting, getCoreRowModel: getCoreRowModel(), getSortedRowModel: getSortedRowModel() });
  return <SortableTable table={table} caption="Stages" testId="t" rowTestId="r" empty="Nothing here." />;
}

const names = () => screen.getAllByTestId("r").map((tr) => within(tr).getAllByRole("cell")[0].textContent);

describe("SortableTable", () => {
  it("marks the sorted column and turns the order round when its header is pressed", () => {
    render(<Harness data={[{ name: "b", gain: 1 }, { name: "c", gain: 3 }, { name: "a", gain: 2 }]} />);
    expect(names()).toEqual(["a", "b", "c"]);
    const nameHeader = screen.getByRole("columnheader", { name: /Name/ });
    expect(nameHeader.getAttribute("aria-sort")).toBe("ascending");
    fireEvent.click(within(nameHeader).getByRole("button"));
    expect(nameHeader.getAttribute("aria-sort")).toBe("descending");
    expect(names()).toEqual(["c", "b", "a"]);

    fireEvent.click(within(screen.getByRole("columnheader", { name: /Gain/ })).getByRole("button"));
    expect(screen.getByRole("columnheader", { name: /Gain/ }).getAttribute("aria-sort")).not.toBeNull();
    expect(screen.getByRole("columnheader", { name: /Name/ }).getAttribute("aria-sort")).toBeNull();
  });

  it("gives a column that cannot sort a plain header, and says so across the table when there are no rows", () => {
    render(<Harness data={[]} />);
    expect(within(screen.getByRole("columnheader", { name: "Commands" })).queryByRole("button")).toBeNull();
    const empty = screen.getByText("Nothing here.");
    expect(empty.getAttribute("colspan")).toBe("3");
    expect(screen.queryAllByTestId("r")).toHaveLength(0);
  });
});
