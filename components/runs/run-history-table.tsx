"use client";

import {
  type ColumnDef,
  type ColumnFiltersState,
  type FilterFn,
  flexRender,
  getCoreRowModel,
  getFilteredRowModel,
  getSortedRowModel,
  type SortingState,
  useReactTable,
} from "@tanstack/react-table";
import Link from "next/link";
import { useMemo, useState } from "react";
import { PassRateChart } from "./pass-rate-chart";
import type { RunHistoryItem } from "./run-history-types";
import { VerdictBadge } from "./verdict-badge";
import { formatDateTime } from "@/components/ui/format-date";
import { Timestamp } from "@/components/ui/timestamp";

const equals: FilterFn<RunHistoryItem> = (row, columnId, value) =>
  value === "" || value === undefined || row.getValue(columnId) === value;

/** Keeps rows whose day (UTC) lies within [from, to]; either end may be empty. */
const dayRange: FilterFn<RunHistoryItem> = (row, columnId, value: [string, string]) => {
  const day = String(row.getValue(columnId)).slice(0, 10);
  const [from, to] = value ?? ["", ""];
  return (from === "" || day >= from) && (to === "" || day <= to);
};

const columns: ColumnDef<RunHistoryItem>[] = [
  {
    id: "select",
    header: () => <span className="sr-only">Compare</span>,
    cell: () => null,
    enableSorting: false,
  },
  {
    accessorKey: "createdAt",
    header: "When",
    filterFn: dayRange,
    cell: ({ getValue }) => <Timestamp value={String(getValue())} relative />,
  },
  {
    accessorKey: "scenarioName",
    header: "Scenario",
    cell: ({ row }) => (
      <Link href={`/runs/${row.original.id}`} className="text-copper-deep underline">
        {row.original.scenarioName}
      </Link>
    ),
  },
  {
    accessorKey: "benchId",
    header: "Bench",
    filterFn: equals,
    cell: ({ row }) => (
      <span>
        {row.original.benchName}{" "}
        <span className="text-ink-soft">rev. {row.original.revisionNumber}</span>
      </span>
    ),
  },
  { accessorKey: "seed", header: "Seed" },
  {
    accessorKey: "startedByName",
    header: "Run by",
    filterFn: equals,
    cell: ({ getValue }) => String(getValue() ?? "former member"),
  },
  {
    accessorKey: "stepsPassed",
    header: "Steps",
    cell: ({ row }) =>
      row.original.status === "finished"
        ? `${row.original.stepsPassed}/${row.original.stepsTotal}`
        : "—",
  },
  {
    accessorKey: "verdict",
    header: "Verdict",
    filterFn: equals,
    cell: ({ row }) => <VerdictBadge verdict={row.original.verdict} status={row.original.status} />,
  },
];

const selectClass = "rounded-md border border-paper-line bg-white px-2 py-1.5 text-sm";

/**
 * Run history: filter by verdict, bench, person and date; sort by any column;
 * pick two runs of the same scenario to compare. The chart follows the filters.
 */
export function RunHistoryTable({ runs }: { runs: readonly RunHistoryItem[] }) {
  const [sorting, setSorting] = useState<SortingState>([{ id: "createdAt", desc: true }]);
  const [filters, setFilters] = useState<ColumnFiltersState>([]);
  const [picked, setPicked] = useState<string[]>([]);
  const data = useMemo(() => [...runs], [runs]);
  // TanStack Table's instance is not memoisable; the compiler skipping this component is expected.
  // eslint-disable-next-line react-hooks/incompatible-library
  const table = useReactTable({
    data,
    columns,
    state: { sorting, columnFilters: filters },
    onSortingChange: setSorting,
    onColumnFiltersChange: setFilters,
    getCoreRowModel: getCoreRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
    getSortedRowModel: getSortedRowModel(),
  });

  const filterValue = (id: string) => (filters.find((f) => f.id === id)?.value ?? "") as string;
  const setFilter = (id: string, value: unknown) =>
    setFilters((current) => [...current.filter((f) => f.id !== id), { id, value }]);
  const [from, to] = (filters.find((f) => f.id === "createdAt")?.value as [string, string]) ?? [
    "",
    "",
  ];

  const benches = [...new Map(runs.map((r) => [r.benchId, r.benchName])).entries()];
  const people = [
    ...new Set(runs.map((r) => r.startedByName).filter((n): n is string => !!n)),
  ].sort();
  const shown = table.getRowModel().rows.map((row) => row.original);

  const pickedRuns = picked
    .map((id) => runs.find((r) => r.id === id))
    .filter((r) => r !== undefined);
  const comparable =
    pickedRuns.length === 2 &&
    pickedRuns[0]!.scenarioId !== null &&
    pickedRuns[0]!.scenarioId === pickedRuns[1]!.scenarioId;
  const toggle = (id: string) =>
    setPicked((current) =>
      current.includes(id) ? current.filter((x) => x !== id) : [...current, id].slice(-2),
    );

  return (
    <div className="flex flex-col gap-4">
      <div className="flex flex-wrap items-end gap-3" role="group" aria-label="Filters">
        <label className="flex flex-col gap-1 text-xs text-ink-soft">
          Verdict
          <select
            className={selectClass}
            value={filterValue("verdict")}
            onChange={(e) => setFilter("verdict", e.target.value)}
          >
            <option value="">any</option>
            <option value="pass">passed</option>
            <option value="fail">failed</option>
            <option value="error">could not run</option>
          </select>
        </label>
        <label className="flex flex-col gap-1 text-xs text-ink-soft">
          Bench
          <select
            className={selectClass}
            value={filterValue("benchId")}
            onChange={(e) => setFilter("benchId", e.target.value)}
          >
            <option value="">any</option>
            {benches.map(([id, name]) => (
              <option key={id} value={id}>
                {name}
              </option>
            ))}
          </select>
        </label>
        <label className="flex flex-col gap-1 text-xs text-ink-soft">
          Person
          <select
            className={selectClass}
            value={filterValue("startedByName")}
            onChange={(e) => setFilter("startedByName", e.target.value)}
          >
            <option value="">anyone</option>
            {people.map((name) => (
              <option key={name} value={name}>
                {name}
              </option>
            ))}
          </select>
        </label>
        <label className="flex flex-col gap-1 text-xs text-ink-soft">
          From
          <input
            type="date"
            className={selectClass}
            value={from}
            onChange={(e) => setFilter("createdAt", [e.target.value, to])}
          />
        </label>
        <label className="flex flex-col gap-1 text-xs text-ink-soft">
          To
          <input
            type="date"
            className={selectClass}
            value={to}
            onChange={(e) => setFilter("createdAt", [from, e.target.value])}
          />
        </label>
        <span className="ml-auto flex items-center gap-2 text-sm">
          {comparable ? (
            <Link
              className="rounded-md bg-copper px-3 py-1.5 font-medium text-white hover:bg-copper-deep"
              href={`/runs/diff?a=${pickedRuns[0]!.id}&b=${pickedRuns[1]!.id}`}
            >
              Compare the two runs
            </Link>
          ) : (
            <span className="text-ink-soft">Tick two runs of one scenario to compare them.</span>
          )}
        </span>
      </div>

      <PassRateChart runs={shown} />

      <div className="overflow-x-auto">
        <table className="w-full text-left text-sm" aria-label="Run history">
          <thead>
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id} className="border-b border-paper-line text-ink-soft">
                {group.headers.map((header) => (
                  <th key={header.id} className="py-2 pr-3 font-medium">
                    {header.column.getCanSort() ? (
                      <button
                        type="button"
                        onClick={header.column.getToggleSortingHandler()}
                        className="hover:text-ink"
                      >
                        {flexRender(header.column.columnDef.header, header.getContext())}
                        {{ asc: " ▲", desc: " ▼" }[header.column.getIsSorted() as string] ?? ""}
                      </button>
                    ) : (
                      flexRender(header.column.columnDef.header, header.getContext())
                    )}
                  </th>
                ))}
              </tr>
            ))}
          </thead>
          <tbody>
            {table.getRowModel().rows.length === 0 ? (
              <tr>
                <td colSpan={columns.length} className="py-4 text-ink-soft">
                  No runs match.
                </td>
              </tr>
            ) : (
              table.getRowModel().rows.map((row) => (
                <tr key={row.id} className="border-b border-paper-line/60">
                  {row.getVisibleCells().map((cell) => (
                    <td key={cell.id} className="py-2 pr-3">
                      {cell.column.id === "select" ? (
                        <input
                          type="checkbox"
                          aria-label={`Compare run of ${row.original.scenarioName} at ${formatDateTime(row.original.createdAt)}`}
                          checked={picked.includes(row.original.id)}
                          onChange={() => toggle(row.original.id)}
                        />
                      ) : (
                        flexRender(cell.column.columnDef.cell, cell.getContext())
                      )}
                    </td>
                  ))}
                </tr>
              ))
            )}
          </tbody>
        </table>
      </div>
    </div>
  );
}
