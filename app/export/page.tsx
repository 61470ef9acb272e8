import { getRecordFacets } from "@/lib/server/records-facets";
import { listExports } from "@/lib/server/exports";
import { Alert } from "../_components/alert";
import { Button } from "../_components/button";
import { formatDateTime } from "../_components/format";
import { LoadError } from "../_components/load-error";
import { PageHeader } from "../_components/page-header";
import { DownloadList, ExportBuilder } from "./_components/export-builder";
import { rerunExportAction } from "./actions";

export const dynamic = "force-dynamic";
export const metadata = { title: "Training-set export" };

type Props = { searchParams: Promise<{ run?: string; identical?: string; of?: string; error?: string }> };

export default async function ExportPage({ searchParams }: Props) {
  const params = await searchParams;
  const [facets, runs] = await Promise.all([getRecordFacets(), listExports()]);
  if (!facets.ok) return <LoadError error={facets.error} what="the export builder" />;
  if (!runs.ok) return <LoadError error={runs.error} what="the saved exports" />;
  const highlighted = runs.data.find((r) => r.name === params.run);
  return (
    <>
      <PageHeader
        eyebrow="Export"
        title="Training-set export"
        description="A clean, class-balanced, physics-featured training set with its datasheet: CSV and Parquet per split, DATASHEET.md and manifest.json. The same records, options and seed give byte-identical files."
      />
      {params.error ? <Alert tone="error" title="The export was not run again">{params.error}</Alert> : null}
      {highlighted ? (
        <Alert tone="info" title={`Export “${highlighted.name}” saved`}>
          {params.of ? <p>{params.identical === "1" ? `Every file is byte-identical to “${params.of}”.` : `Some files differ from “${params.of}”: the records changed since.`}</p> : null}
          <DownloadList name={highlighted.name} files={highlighted.files} />
        </Alert>
      ) : null}
      <ExportBuilder alloys={facets.data.alloys} sources={facets.data.sources} />
      <section className="panel" aria-labelledby="saved-title">
        <div className="panel__title">
          <h2 id="saved-title">Saved exports</h2>
          <span className="muted">{runs.data.length} run(s)</span>
        </div>
        {runs.data.length === 0 ? (
          <p className="muted">No export has been run yet.</p>
        ) : (
          <div className="table-wrap">
            <table className="table">
              <thead>
                <tr>
                  <th scope="col">Name</th>
                  <th scope="col">When</th>
                  <th scope="col" className="num">Seed</th>
                  <th scope="col">Files</th>
                  <th scope="col">
                    <span className="visually-hidden">Actions</span>
                  </th>
                </tr>
              </thead>
              <tbody>
                {runs.data.map((r) => (
                  <tr key={r.name}>
                    <td>{r.name}</td>
                    <td style={{ whiteSpace: "nowrap" }}>{formatDateTime(r.createdAt)}</td>
                    <td className="num">{r.seed}</td>
                    <td>
                      {r.files.map((f, i) => (
                        <span key={f.name}>
                          {i ? " · " : ""}
                          <a href={`/api/exports/${encodeURIComponent(r.name)}/${encodeURIComponent(f.name)}`} download>
                            {f.name}
                          </a>
                        </span>
                      ))}
                    </td>
                    <td>
                      <form action={rerunExportAction}>
                        <input type="hidden" name="name" value={r.name} />
                        <Button type="submit" size="small" aria-label={`Run ${r.name} again`}>
                          Run again
                        </Button>
                      </form>
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </section>
    </>
  );
}
