import { WideTable } from "./wide-table";

/** A column's header; `more` columns wait behind "More columns" below 768 px (mark their cells `data-more=""` too). */
export interface DataColumn {
  header: React.ReactNode;
  more?: boolean;
}

/**
 * A data table in `WideTable`: its column headers from `columns`, its body rows as children.
 * The count behind "More columns" is the number of `more` columns.
 */
export function DataTable({
  label,
  testId,
  columns,
  children,
}: {
  label: string;
  testId?: string;
  columns: DataColumn[];
  children: React.ReactNode;
}) {
  return (
    <WideTable label={label} more={columns.filter((c) => c.more).length}>
      <table className="data-table" data-testid={testId}>
        <thead>
          <tr>
            {columns.map((c, i) => (
              <th key={i} scope="col" data-more={c.more ? "" : undefined}>
                {c.header}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>{children}</tbody>
      </table>
    </WideTable>
  );
}
