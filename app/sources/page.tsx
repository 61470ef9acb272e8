import Link from "next/link";
import { listSources } from "@/lib/server/sources";
import { ButtonLink } from "../_components/button";
import { DataTable } from "../_components/data-table";
import { EmptyState } from "../_components/empty-state";
import { formatNumber, plural } from "../_components/format";
import { LoadError } from "../_components/load-error";
import { PageHeader } from "../_components/page-header";
import { kindLabel } from "./_lib/labels";

export const dynamic = "force-dynamic";
export const metadata = { title: "Sources" };

export default async function SourcesPage() {
  const result = await listSources();
  if (!result.ok) return <LoadError error={result.error} what="the sources" />;
  const sources = result.data;
  return (
    <>
      <PageHeader
        title="Sources"
        description={sources.length ? `${plural(sources.length, "source")}: where each build record comes from.` : "Where each build record comes from."}
        actions={
          <ButtonLink href="/sources/new" variant="primary">
            Add a source
          </ButtonLink>
        }
      />
      <DataTable
        rows={sources}
        rowKey={(s) => s.id}
        empty={
          <div className="panel">
            <EmptyState title="No sources yet" actions={<ButtonLink href="/sources/new" variant="primary">Add the first source</ButtonLink>}>
              <p>Add the paper, thesis, report or shop trial you are reading; its records are keyed in against it.</p>
            </EmptyState>
          </div>
        }
        columns={[
          { key: "id", header: "#", numeric: true, width: "4rem", cell: (s) => s.id },
          {
            key: "title",
            header: "Title",
            cell: (s) => (
              <>
                <Link href={`/sources/${s.id}`}>{s.title}</Link>
                {s.authors.length ? <div className="muted" style={{ fontSize: "0.86rem" }}>{s.authors.length > 3 ? `${s.authors.slice(0, 3).join("; ")} et al.` : s.authors.join("; ")}</div> : null}
              </>
            ),
          },
          { key: "kind", header: "Kind", cell: (s) => <span style={{ whiteSpace: "nowrap" }}>{kindLabel(s.kind)}</span> },
          { key: "year", header: "Year", numeric: true, cell: (s) => s.year ?? "—" },
          {
            key: "doi",
            header: "DOI",
            cell: (s) => (s.doi ? <a className="mono" href={`https://doi.org/${s.doi}`} rel="noreferrer">{s.doi}</a> : <span className="muted">—</span>),
          },
          {
            key: "records",
            header: "Records",
            numeric: true,
            cell: (s) => (s.recordCount ? <Link href={`/records?sourceId=${s.id}`}>{formatNumber(s.recordCount, 0)}</Link> : <span className="muted">0</span>),
          },
        ]}
      />
    </>
  );
}
