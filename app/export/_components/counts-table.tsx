/** Rows per split and class, before and after balancing. */
export function CountsTable({ partitions, before, after, caption }: { partitions: string[]; before: Record<string, Record<string, number>>; after: Record<string, Record<string, number>>; caption: string }) {
  const classes = [...new Set(partitions.flatMap((p) => [...Object.keys(before[p] ?? {}), ...Object.keys(after[p] ?? {})]))].sort();
  return (
    <div className="table-wrap">
      <table className="table">
        <caption>{caption}</caption>
        <thead>
          <tr>
            <th scope="col">Split</th>
            {classes.map((c) => (
              <th scope="col" className="num" key={c}>
                {c.replace(/_/g, " ")}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {partitions.map((p) => (
            <tr key={p}>
              <th scope="row">{p.replace("_", " ")}</th>
              {classes.map((c) => {
                const b = before[p]?.[c] ?? 0;
                const a = after[p]?.[c] ?? 0;
                return (
                  <td className="num" key={c}>
                    {a === b ? b : `${b} → ${a}`}
                  </td>
                );
              })}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
