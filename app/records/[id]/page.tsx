import Link from "next/link";
import { notFound } from "next/navigation";
import { energyDensities } from "@/lib/domain/energy-density";
import { CANONICAL_UNIT } from "@/lib/domain/units";
import { RECORD_QUANTITY_FIELD_NAMES, RECORD_QUANTITY_FIELDS, canonicalKeyOf } from "@/lib/schemas/record";
import { getRecordPage } from "@/lib/server/records";
import { Alert } from "../../_components/alert";
import { HistoryPanel } from "../../_components/audit-history";
import { fieldLabel } from "../../_components/audit-diff";
import { FlashNotice } from "../../_components/flash-notice";
import { ButtonLink } from "../../_components/button";
import { formatDateTime, formatNumber, formatSignificant } from "../../_components/format";
import { spotDefinitionShort } from "../../_components/labels";
import { LoadError } from "../../_components/load-error";
import { OutcomeLabel } from "../../_components/outcome-label";
import { PageHeader } from "../../_components/page-header";
import { StatusBadge } from "../../_components/status-badge";
import { RejectForm } from "../_components/reject-form";
import { rejectRecordAction } from "../actions";

export const dynamic = "force-dynamic";

type Props = { params: Promise<{ id: string }> };

export async function generateMetadata({ params }: Props) {
  const { id } = await params;
  return { title: `Record ${id}` };
}

const SAVED: Record<string, string> = { created: "Record saved", updated: "Changes saved", rejected: "Record rejected" };
const PROVENANCE: Record<string, string> = { reported: "Reported", derived: "Derived", assumed: "Assumed default" };

export default async function RecordPage({ params }: Props) {
  const { id } = await params;
  const result = await getRecordPage(Number(id));
  if (!result.ok) {
    if (result.error.code === "not_found") notFound();
    return <LoadError error={result.error} what={`record ${id}`} />;
  }
  const { record: r, history } = result.data;
  const editable = r.status !== "rejected" && r.status !== "merged";
  const energy = energyDensities(r);
  const rejection = [...history].reverse().find((e) => e.action === "reject");

  return (
    <>
      <PageHeader
        eyebrow={<Link href="/records">Records</Link>}
        title={
          <>
            Record {r.id}: {r.material.designation}
          </>
        }
        description={
          <>
            From <Link href={`/sources/${r.source.id}`}>{r.source.title}</Link>
            {r.source.year ? ` (${r.source.year})` : ""}
            {r.locationLabel || r.locationPage ? ` · ${[r.locationLabel, r.locationPage ? `p. ${r.locationPage}` : null].filter(Boolean).join(", ")}` : ""}
          </>
        }
        actions={editable ? <ButtonLink href={`/records/${r.id}/edit`} variant="primary">Edit record</ButtonLink> : undefined}
      />
      <FlashNotice key={r.version} entity={`record-${r.id}`} messages={SAVED} />
      {r.status === "rejected" ? (
        <Alert tone="warning" title="This record is rejected">
          <p>It stays in the collection for the history and is left out of exports.{rejection?.reason ? ` Reason: ${rejection.reason}` : ""}</p>
        </Alert>
      ) : null}

      <div className="two-column">
        <div>
          <section className="panel" aria-labelledby="values">
            <div className="panel__title">
              <h2 id="values">Values as entered and as stored</h2>
              <span className="muted">stored in one canonical unit per quantity</span>
            </div>
            <div className="table-wrap">
              <table className="table compare-table">
                <thead>
                  <tr>
                    <th scope="col">Quantity</th>
                    <th scope="col">As entered</th>
                    <th scope="col">Provenance</th>
                    <th scope="col" className="num">
                      Stored
                    </th>
                    <th scope="col">Unit</th>
                  </tr>
                </thead>
                <tbody>
                  {RECORD_QUANTITY_FIELD_NAMES.map((field) => {
                    const entered = r.enteredValues[field];
                    const stored = r[canonicalKeyOf(field) as keyof typeof r] as number | null;
                    if (!entered && stored === null) return null;
                    const name = fieldLabel(`enteredValues.${field}`).replace(/ as entered$/, "");
                    return (
                      <tr key={field}>
                        <th scope="row" style={{ fontWeight: 500 }}>
                          {name}
                          {field === "spotDiameter" && r.spotDefinition ? <span className="muted"> ({spotDefinitionShort(r.spotDefinition)} in the source)</span> : null}
                        </th>
                        <td className="entered">{entered ? `${entered.text} ${entered.unit}`.trim() : "—"}</td>
                        <td>{entered ? (PROVENANCE[entered.provenance] ?? entered.provenance) : "—"}</td>
                        <td className="num">{formatNumber(stored, 4)}</td>
                        <td>{CANONICAL_UNIT[RECORD_QUANTITY_FIELDS[field]]}{field === "spotDiameter" ? " (1/e²)" : ""}</td>
                      </tr>
                    );
                  })}
                </tbody>
              </table>
            </div>
          </section>

          <div className="pair">
          <section className="panel" aria-labelledby="derived">
            <div className="panel__title">
              <h2 id="derived">Derived energy densities</h2>
              <span className="muted">from the stored values</span>
            </div>
            <dl className="definition-list">
              <dt>Linear, E_l = P/v</dt>
              <dd className="num">{energy.linearJPerMm === null ? "— (needs P and v)" : `${formatSignificant(energy.linearJPerMm)} J/mm`}</dd>
              <dt>Areal, E_a = P/(v·h)</dt>
              <dd className="num">{energy.arealJPerMm2 === null ? "— (needs P, v and h)" : `${formatSignificant(energy.arealJPerMm2)} J/mm²`}</dd>
              <dt>Volumetric, E_v = P/(v·h·t)</dt>
              <dd className="num">{energy.volumetricJPerMm3 === null ? "— (needs P, v, h and t)" : `${formatSignificant(energy.volumetricJPerMm3)} J/mm³`}</dd>
            </dl>
          </section>

          <section className="panel" aria-labelledby="process">
            <div className="panel__title">
              <h2 id="process">Outcome and conditions</h2>
            </div>
            <dl className="definition-list">
              <dt>Outcome</dt>
              <dd>
                <OutcomeLabel outcome={r.outcome} />
              </dd>
              <dt>As written</dt>
              <dd>{r.outcomeText ?? "—"}</dd>
              <dt>Relative density</dt>
              <dd className="num">{r.relativeDensityPct === null ? "—" : `${formatNumber(r.relativeDensityPct, 3)} %`}</dd>
              <dt>Machine</dt>
              <dd>{r.machine ?? "—"}</dd>
              <dt>Atmosphere</dt>
              <dd>{r.atmosphere ?? "—"}</dd>
              <dt>Scan strategy</dt>
              <dd>{r.scanStrategy ?? "—"}</dd>
            </dl>
          </section>
          </div>
          <section className="panel" aria-labelledby="material">
            <div className="panel__title">
              <h2 id="material">Material</h2>
              <span className="muted">{r.material.compositionKind === "measured" ? "measured composition" : "nominal composition"}, {r.material.basis === "at" ? "at%" : "wt%"}</span>
            </div>
            <dl className="definition-list" style={{ marginBottom: "0.75rem" }}>
              <dt>As written</dt>
              <dd>{r.material.designation}</dd>
              <dt>Alloy key</dt>
              <dd>
                <Link href={`/records?alloy=${encodeURIComponent(r.alloyKey)}`}>{r.alloyKey}</Link>
              </dd>
            </dl>
            {r.material.components.length ? (
              <div className="table-wrap">
                <table className="table">
                  <caption className="visually-hidden">Composition in {r.material.basis === "at" ? "at%" : "wt%"}</caption>
                  <tbody>
                    <tr>
                      <th scope="row">Element</th>
                      {r.material.components.map((c) => (
                        <th scope="col" key={c.element} className="num">
                          {c.element}
                        </th>
                      ))}
                    </tr>
                    <tr>
                      <th scope="row">{r.material.basis === "at" ? "at%" : "wt%"}</th>
                      {r.material.components.map((c) => (
                        <td key={c.element} className="num">
                          {c.isBalance ? <abbr title={`balance: ${formatNumber(c.amount, 3)}`}>bal.</abbr> : formatNumber(c.amount, 3)}
                        </td>
                      ))}
                    </tr>
                  </tbody>
                </table>
              </div>
            ) : (
              <p className="muted">No composition: the alloy is not a grade in the library and was not given as a designation.</p>
            )}
          </section>

        </div>

        <div>
          <section className="panel" aria-labelledby="status">
            <div className="panel__title">
              <h2 id="status">Status</h2>
              <StatusBadge status={r.status} />
            </div>
            <dl className="definition-list" style={{ marginBottom: "0.9rem" }}>
              <dt>Version</dt>
              <dd className="num">{r.version}</dd>
              <dt>Created</dt>
              <dd>{formatDateTime(r.createdAt)}</dd>
              <dt>Last changed</dt>
              <dd>{formatDateTime(r.updatedAt)}</dd>
              {r.qualityScore !== null ? (
                <>
                  <dt>Quality</dt>
                  <dd className="num">{formatNumber(r.qualityScore, 2)}</dd>
                </>
              ) : null}
              {r.importFile ? (
                <>
                  <dt>Imported from</dt>
                  <dd>
                    {r.importFile}
                    {r.importRow ? `, row ${r.importRow}` : ""}
                  </dd>
                </>
              ) : null}
            </dl>
            {r.status !== "rejected" ? <RejectForm id={r.id} version={r.version} action={rejectRecordAction} /> : null}
          </section>

          <section className="panel" aria-labelledby="source">
            <div className="panel__title">
              <h2 id="source">Source and location</h2>
            </div>
            <dl className="definition-list">
              <dt>Source</dt>
              <dd>
                <Link href={`/sources/${r.source.id}`}>{r.source.title}</Link>
              </dd>
              <dt>Year</dt>
              <dd>{r.source.year ?? "—"}</dd>
              <dt>DOI</dt>
              <dd>{r.source.doi ? <a className="mono" href={`https://doi.org/${r.source.doi}`} rel="noreferrer">{r.source.doi}</a> : "—"}</dd>
              <dt>Page</dt>
              <dd>{r.locationPage ?? "—"}</dd>
              <dt>Location</dt>
              <dd>{r.locationLabel ?? "—"}</dd>
            </dl>
            <p style={{ margin: "0.75rem 0 0" }}>
              <Link href={`/records?sourceId=${r.source.id}`}>All records from this source</Link>
            </p>
          </section>

          <HistoryPanel events={history} />
        </div>
      </div>
    </>
  );
}
