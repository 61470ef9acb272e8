import { getImportPage } from "@/lib/server/import-jobs";
import { formatDateTime, formatNumber } from "../_components/format";
import { LoadError } from "../_components/load-error";
import { PageHeader } from "../_components/page-header";
import { ImportFlow } from "./_components/import-flow";

export const dynamic = "force-dynamic";
export const metadata = { title: "Import a table" };

const STATUS: Record<string, string> = { committed: "imported", cancelled: "cancelled", failed: "failed" };

export default async function ImportPage({ searchParams }: { searchParams: Promise<{ sourceId?: string }> }) {
  const [{ sourceId }, result] = await Promise.all([searchParams, getImportPage()]);
  if (!result.ok) return <LoadError error={result.error} what="the import page" />;
  const { sources, recent } = result.data;
  const preselected = sources.find((s) => String(s.id) === sourceId)?.id ?? null;
  return (
    <>
      <PageHeader eyebrow="Records" title="Import a table" description="A spreadsheet, a table pasted from a paper, or one boxed in its PDF: map the columns, check every row, then import all of them or none." />
      <ImportFlow sources={sources} initialSourceId={preselected} />
      {recent.length ? (
        <section className="panel" aria-labelledby="recent-imports" style={{ marginTop: "1rem" }}>
          <div className="panel__title">
            <h2 id="recent-imports">Recent imports</h2>
          </div>
          <div className="table-wrap">
            <table className="table">
              <thead>
                <tr>
                  <th scope="col" className="num">Run</th>
                  <th scope="col">File</th>
                  <th scope="col">Kind</th>
                  <th scope="col">Result</th>
                  <th scope="col" className="num">Rows</th>
                  <th scope="col" className="num">Imported</th>
                  <th scope="col" className="num">Left out</th>
                  <th scope="col">When</th>
                </tr>
              </thead>
              <tbody>
                {recent.map((r) => (
                  <tr key={r.id}>
                    <td className="num">{r.id}</td>
                    <td>
                      {r.fileName}
                      {r.sheet ? <span className="muted"> · {r.sheet}</span> : null}
                    </td>
                    <td>{r.format === "pdf_table" ? "PDF table" : r.format.toUpperCase()}</td>
                    <td>{STATUS[r.status] ?? r.status}</td>
                    <td className="num">{formatNumber(r.rowCount, 0)}</td>
                    <td className="num">{formatNumber(r.importedCount, 0)}</td>
                    <td className="num">{formatNumber(r.excludedCount, 0)}</td>
                    <td>{formatDateTime(r.createdAt)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </section>
      ) : null}
    </>
  );
}
