"use client";

import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import {
  type ColumnDef,
  flexRender,
  getCoreRowModel,
  getFilteredRowModel,
  getSortedRowModel,
  type SortingState,
  useReactTable,
} from "@tanstack/react-table";
import { useMemo, useState } from "react";
import type { Role } from "@/db/schema";
import { Button } from "@/components/ui/button";
import { StatusBadge } from "@/components/ui/status-badge";
import { errorText, getJson, sendJson } from "../_shell/api-client";

export interface MemberRow {
  readonly membershipId: string;
  readonly userId: string;
  readonly name: string;
  readonly email: string;
  readonly role: Role;
  readonly disabled: boolean;
  readonly joinedAt: string;
  readonly isYou: boolean;
}

const membersKey = ["members"] as const;
// Spelled out rather than imported: db/schema would pull the database layer into the browser bundle.
const roleOptions: readonly Role[] = ["admin", "trainer", "engineer", "qa", "apprentice"];

/** Members with sorting, a text filter and, for admins, role change and removal. */
export function MembersTable({ canManage }: { canManage: boolean }) {
  const queryClient = useQueryClient();
  const members = useQuery({
    queryKey: membersKey,
    queryFn: () => getJson<{ members: MemberRow[] }>("/api/members").then((body) => body.members),
  });
  const [sorting, setSorting] = useState<SortingState>([{ id: "name", desc: false }]);
  const [filter, setFilter] = useState("");
  const [actionError, setActionError] = useState<string | null>(null);

  const changeRole = useMutation({
    mutationFn: ({ membershipId, role }: { membershipId: string; role: Role }) =>
      sendJson(`/api/members/${membershipId}`, "PATCH", { role }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: membersKey }),
    onError: (error) => setActionError(errorText(error)),
  });
  const remove = useMutation({
    mutationFn: (membershipId: string) => sendJson(`/api/members/${membershipId}`, "DELETE"),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: membersKey }),
    onError: (error) => setActionError(errorText(error)),
  });

  const columns = useMemo<ColumnDef<MemberRow>[]>(
    () => [
      {
        id: "name",
        accessorKey: "name",
        header: "Name",
        cell: ({ row }) => (
          <span className="font-medium">
            {row.original.name}
            {row.original.isYou ? <span className="ml-2 text-xs text-ink-soft">(you)</span> : null}
            {row.original.disabled ? (
              <span className="ml-2">
                <StatusBadge tone="fault">disabled</StatusBadge>
              </span>
            ) : null}
          </span>
        ),
      },
      { id: "email", accessorKey: "email", header: "E-mail" },
      {
        id: "role",
        accessorKey: "role",
        header: "Role",
        cell: ({ row }) =>
          canManage && !row.original.isYou ? (
            <select
              aria-label={`Role of ${row.original.name}`}
              className="rounded-md border border-paper-line bg-paper px-2 py-1 text-sm"
              value={row.original.role}
              disabled={changeRole.isPending}
              onChange={(event) => {
                setActionError(null);
                changeRole.mutate({
                  membershipId: row.original.membershipId,
                  role: event.target.value as Role,
                });
              }}
            >
              {roleOptions.map((role) => (
                <option key={role} value={role}>
                  {role}
                </option>
              ))}
            </select>
          ) : (
            row.original.role
          ),
      },
      {
        id: "joinedAt",
        accessorKey: "joinedAt",
        header: "Joined",
        cell: ({ row }) => row.original.joinedAt.slice(0, 10),
      },
      ...(canManage
        ? [
            {
              id: "actions",
              header: "",
              enableSorting: false,
              cell: ({ row }) =>
                row.original.isYou ? null : (
                  <Button
                    variant="secondary"
                    disabled={remove.isPending}
                    onClick={() => {
                      if (!window.confirm(`Remove ${row.original.name} from this workspace?`))
                        return;
                      setActionError(null);
                      remove.mutate(row.original.membershipId);
                    }}
                  >
                    Remove
                  </Button>
                ),
            } satisfies ColumnDef<MemberRow>,
          ]
        : []),
    ],
    [canManage, changeRole, remove],
  );

  // TanStack Table v8 returns fresh functions each render, so the React Compiler
  // leaves this component unmemoized; a members list is small enough for that.
  // eslint-disable-next-line react-hooks/incompatible-library
  const table = useReactTable({
    data: members.data ?? [],
    columns,
    state: { sorting, globalFilter: filter },
    onSortingChange: setSorting,
    onGlobalFilterChange: setFilter,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
  });

  if (members.isPending) return <p className="text-sm text-ink-soft">Loading members…</p>;
  if (members.isError) {
    return (
      <p role="alert" className="text-sm text-fault">
        Could not load the members: {errorText(members.error)}
      </p>
    );
  }

  return (
    <div className="flex flex-col gap-3">
      <input
        type="search"
        aria-label="Filter members"
        placeholder="Filter by name, e-mail or role"
        className="max-w-xs rounded-md border border-paper-line bg-white/70 px-3 py-2 text-sm"
        value={filter}
        onChange={(event) => setFilter(event.target.value)}
      />
      {actionError ? (
        <p role="alert" className="text-sm text-fault">
          {actionError}
        </p>
      ) : null}
      <table className="w-full border-collapse overflow-hidden rounded-lg border border-paper-line text-sm">
        <thead className="bg-paper-deep text-left">
          {table.getHeaderGroups().map((group) => (
            <tr key={group.id}>
              {group.headers.map((header) => {
                const sorted = header.column.getIsSorted();
                return (
                  <th
                    key={header.id}
                    className="px-3 py-2 font-medium"
                    aria-sort={
                      sorted === "asc" ? "ascending" : sorted === "desc" ? "descending" : undefined
                    }
                  >
                    {header.column.getCanSort() ? (
                      <button
                        type="button"
                        onClick={header.column.getToggleSortingHandler()}
                        className="flex items-center gap-1"
                      >
                        {flexRender(header.column.columnDef.header, header.getContext())}
                        <span aria-hidden="true">
                          {sorted === "asc" ? "▲" : sorted === "desc" ? "▼" : ""}
                        </span>
                      </button>
                    ) : (
                      flexRender(header.column.columnDef.header, header.getContext())
                    )}
                  </th>
                );
              })}
            </tr>
          ))}
        </thead>
        <tbody>
          {table.getRowModel().rows.map((row) => (
            <tr key={row.id} className="border-t border-paper-line">
              {row.getVisibleCells().map((cell) => (
                <td key={cell.id} className="px-3 py-2">
                  {flexRender(cell.column.columnDef.cell, cell.getContext())}
                </td>
              ))}
            </tr>
          ))}
          {table.getRowModel().rows.length === 0 ? (
            <tr>
              <td colSpan={columns.length} className="px-3 py-4 text-ink-soft">
                No member matches the filter.
              </td>
            </tr>
          ) : null}
        </tbody>
      </table>
    </div>
  );
}
