import Link from "next/link";
import { notFound } from "next/navigation";
import { getSourceDetail } from "@/lib/server/source-detail";
import { FlashNotice } from "../../_components/flash-notice";
import { HistoryPanel } from "../../_components/audit-history";
import { ButtonLink } from "../../_components/button";
import { formatDateTime, formatNumber, plural } from "../../_components/format";
import { LoadError } from "../../_components/load-error";
import { PageHeader } from "../../_components/page-header";
import { SourceDocuments } from "../_components/source-documents";
import { SourceForm } from "../_components/source-form";
import { SourceQualityPanel } from "../_components/source-quality-panel";
import { updateSourceAction } from "../actions";
import { densityMethodLabel, kindLabel, outcomeEvidenceLabel, spotDefinitionLabel } from "../_lib/labels";

export const dynamic = "force-dynamic";

type Props = { params: Promise<{ id: string }> };

const SAVED: Record<string, string> = { created: "Source added", updated: "Changes saved" };

export async function generateMetadata({ params }: Props) {
  const { id } = await params;
  return { title: `Source ${id}` };
}

export default async function SourcePage({ params }: Props) {
  const { id } = await params;
  const result = await getSourceDetail(Number(id));
  if (!result.ok) {
    if (result.error.code === "not_found") notFound();
    return <LoadError error={result.error} what={`source ${id}`} />;
  }
  const { source: s, history, recordCount } = result.data;
  const yesNo = (v: boolean) => (v ? "Yes" : "No");
  return (
    <>
      <PageHeader
        eyebrow={<Link href="/sources">Sources</Link>}
        title={s.title}
        description={[kindLabel(s.kind), s.year, s.venue].filter(Boolean).join(" · ")}
        actions={
          <ButtonLink href={`/records/new?sourceId=${s.id}`} variant="primary">
            Key in a record from this source
          </ButtonLink>
        }
      />
      <FlashNotice key={s.version} entity={`source-${s.id}`} messages={SAVED} />
      <div className="two-column">
        <div>
          <section className="panel" aria-labelledby="details">
            <div className="panel__title">
              <h2 id="details">Details</h2>
              <span className="muted">
                source {s.id} · version {s.version}
              </span>
            </div>
            <dl className="definition-list">
              <dt>Authors</dt>
              <dd>{s.authors.length ? s.authors.join("; ") : "—"}</dd>
              <dt>DOI</dt>
              <dd>{s.doi ? <a className="mono" href={`https://doi.org/${s.doi}`} rel="noreferrer">{s.doi}</a> : "—"}</dd>
              <dt>Web address</dt>
              <dd>{s.url ? <a href={s.url} rel="noreferrer">{s.url}</a> : "—"}</dd>
              <dt>Density method</dt>
              <dd>{densityMethodLabel(s.densityMethod)}</dd>
              <dt>Outcome evidence</dt>
              <dd>{outcomeEvidenceLabel(s.outcomeEvidence)}</dd>
              <dt>Spot size definition</dt>
              <dd>{s.spotSizeDefinition ? spotDefinitionLabel(s.spotSizeDefinition) : "Not stated"}</dd>
              <dt>Machine stated</dt>
              <dd>{yesNo(s.machineStated)}</dd>
              <dt>Powder size reported</dt>
              <dd>{yesNo(s.powderReported)}</dd>
              <dt>Atmosphere reported</dt>
              <dd>{yesNo(s.atmosphereReported)}</dd>
              <dt>Notes</dt>
              <dd style={{ whiteSpace: "pre-wrap" }}>{s.notes ?? "—"}</dd>
              <dt>Last changed</dt>
              <dd>{formatDateTime(s.updatedAt)}</dd>
            </dl>
          </section>
          <section className="panel" aria-labelledby="edit">
            <div className="panel__title">
              <h2 id="edit">Edit this source</h2>
            </div>
            <SourceForm key={s.version} action={updateSourceAction} id={s.id} version={s.version} initial={s} submitLabel="Save changes" />
          </section>
        </div>
        <div>
          <section className="panel" aria-labelledby="records">
            <div className="panel__title">
              <h2 id="records">Records</h2>
            </div>
            <p className="stat">
              <span className="stat__value">{formatNumber(recordCount, 0)}</span>
              <span className="stat__label">{recordCount === 1 ? "build record cites" : "build records cite"} this source</span>
            </p>
            <div style={{ display: "flex", gap: "0.5rem", flexWrap: "wrap" }}>
              {recordCount > 0 ? <ButtonLink href={`/records?sourceId=${s.id}`}>See {plural(recordCount, "record")}</ButtonLink> : null}
              <ButtonLink href={`/records/new?sourceId=${s.id}`}>Key in a record</ButtonLink>
            </div>
          </section>
          <SourceDocuments sourceId={s.id} sourceDoi={s.doi} />
          <SourceQualityPanel sourceId={s.id} />
          <HistoryPanel events={history} />
        </div>
      </div>
    </>
  );
}
