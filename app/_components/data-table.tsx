import type { ReactNode } from "react";

export interface Column<T> {
  key: string;
  header: ReactNode;
  /** Numbers are right-aligned with tabular figures. */
  numeric?: boolean;
  cell: (row: T) => ReactNode;
  width?: string;
}

/**
 * A plain semantic table for short server-rendered lists (sources, values). The large records
 * table has its own virtualized grid.
 */
export function DataTable<T>({ columns, rows, rowKey, caption, empty }: { columns: readonly Column<T>[]; rows: readonly T[]; rowKey: (row: T) => string | number; caption?: ReactNode; empty?: ReactNode }) {
  if (!rows.length && empty) return <>{empty}</>;
  return (
    <div className="table-wrap">
      <table className="table">
        {caption ? <caption>{caption}</caption> : null}
        <thead>
          <tr>
            {columns.map((c) => (
              <th key={c.key} scope="col" className={c.numeric ? "num" : undefined} style={c.width ? { width: c.width } : undefined}>
                {c.header}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={rowKey(r)}>
              {columns.map((c) => (
                <td key={c.key} className={c.numeric ? "num" : undefined}>
                  {c.cell(r)}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
