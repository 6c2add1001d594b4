"use client";

import { useMemo, type ReactNode } from "react";
import { createSortedRowModel, rowSortingFeature, sortFn_alphanumeric, sortFn_basic, tableFeatures, useTable, type ColumnDef, type RowData } from "@tanstack/react-table";
import { Table, TableCaption, TBody, Td, Th, THead, Tr } from "./table";

const features = tableFeatures({
  rowSortingFeature,
  sortedRowModel: createSortedRowModel(),
  sortFns: { alphanumeric: sortFn_alphanumeric, basic: sortFn_basic },
});

/** One column: a sort key (number or text) and how to show it. */
export type SortColumn<T extends RowData> = {
  id: string;
  header: string;
  value: (row: T) => number | string | null;
  cell?: (row: T) => ReactNode;
  numeric?: boolean;
  /** false for columns that make no sense to sort */
  sortable?: boolean;
};

export type SortableTableProps<T extends RowData> = {
  caption: string;
  columns: SortColumn<T>[];
  rows: T[];
  /** extra attributes per row (e.g. marks for best and worst rows) */
  rowProps?: (row: T) => Record<string, string | undefined>;
  rowClassName?: (row: T) => string | undefined;
  rowKey: (row: T, index: number) => string;
  initialSort?: { id: string; desc: boolean };
};

/** A table sorted by clicking (or Enter on) a column header, with aria-sort on the header. */
export function SortableTable<T extends RowData>({ caption, columns, rows, rowProps, rowClassName, rowKey, initialSort }: SortableTableProps<T>) {
  const defs = useMemo<ColumnDef<typeof features, T>[]>(
    () =>
      columns.map((c) => ({
        id: c.id,
        header: c.header,
        accessorFn: (row: T) => c.value(row) ?? (c.numeric ? Number.NEGATIVE_INFINITY : ""),
        enableSorting: c.sortable !== false,
        sortFn: c.numeric ? "basic" : "alphanumeric",
      })),
    [columns],
  );
  const table = useTable({
    features,
    columns: defs,
    data: rows,
    getRowId: (row: T, index: number) => rowKey(row, index),
    initialState: initialSort ? { sorting: [initialSort] } : undefined,
  });
  const byId = new Map(columns.map((c) => [c.id, c]));
  return (
    <Table dense>
      <TableCaption className="sr-only">{caption}</TableCaption>
      <THead>
        {table.getHeaderGroups().map((group) => (
          <tr key={group.id}>
            {group.headers.map((header) => {
              const col = byId.get(header.column.id)!;
              const sorted = header.column.getIsSorted();
              return (
                <Th
                  key={header.id}
                  numeric={col.numeric}
                  sort={col.sortable === false ? undefined : sorted === "asc" ? "ascending" : sorted === "desc" ? "descending" : "none"}
                  onSort={col.sortable === false ? undefined : () => header.column.toggleSorting(undefined, false)}
                >
                  {col.header}
                </Th>
              );
            })}
          </tr>
        ))}
      </THead>
      <TBody>
        {table.getRowModel().rows.map((row) => (
          <Tr key={row.id} className={rowClassName?.(row.original)} {...(rowProps?.(row.original) ?? {})}>
            {columns.map((c) => (
              <Td key={c.id} numeric={c.numeric}>
                {c.cell ? c.cell(row.original) : String(c.value(row.original) ?? "—")}
              </Td>
            ))}
          </Tr>
        ))}
      </TBody>
    </Table>
  );
}
