import Link from "next/link";
import { OUTCOMES } from "@/lib/domain/outcomes";
import { RECORD_STATUSES } from "@/lib/schemas/record";
import { getDashboard } from "@/lib/server/dashboard";
import { BarChart, type BarDatum } from "./_components/bar-chart";
import { ButtonLink } from "./_components/button";
import { EmptyState } from "./_components/empty-state";
import { formatDateTime, formatNumber, plural } from "./_components/format";
import { LoadError } from "./_components/load-error";
import { outcomeText } from "./_components/outcome-label";
import { PageHeader } from "./_components/page-header";
import { outcomeColour, statusColours } from "./_components/palette";
import { SeverityBadge, statusLabel } from "./_components/status-badge";

export const dynamic = "force-dynamic";

const ALLOYS_SHOWN = 10;

const ACTION_VERB: Record<string, string> = { create: "created", update: "edited", reject: "rejected", accept: "accepted", merge: "merged", import: "imported", seed: "added by the demo seed" };

export default async function HomePage() {
  const result = await getDashboard();
  if (!result.ok) return <LoadError error={result.error} what="the overview" />;
  const { stats, recent, flags } = result.data;

  const statusBars: BarDatum[] = RECORD_STATUSES.filter((s) => (stats.byStatus[s] ?? 0) > 0).map((s) => ({
    label: statusLabel(s),
    href: `/records?status=${s}`,
    segments: [{ key: s, label: statusLabel(s), value: stats.byStatus[s] ?? 0, colour: statusColours(s).bar }],
  }));
  const alloyBars: BarDatum[] = stats.byAlloy.slice(0, ALLOYS_SHOWN).map((a) => ({
    label: a.alloyKey,
    href: `/records?alloy=${encodeURIComponent(a.alloyKey)}`,
    segments: RECORD_STATUSES.map((s) => ({ key: s, label: statusLabel(s), value: a.byStatus[s] ?? 0, colour: statusColours(s).bar })),
  }));
  const outcomeBars: BarDatum[] = OUTCOMES.filter((o) => (stats.byOutcome[o] ?? 0) > 0).map((o) => ({
    label: outcomeText(o),
    href: `/records?outcome=${o}`,
    segments: [{ key: o, label: outcomeText(o), value: stats.byOutcome[o] ?? 0, colour: outcomeColour(o) }],
  }));

  return (
    <>
      <PageHeader
        title="Collection overview"
        description="Build records keyed in from sources, normalized to one unit per quantity, with every change kept in the history."
        actions={
          <>
            <ButtonLink href="/sources/new">Add a source</ButtonLink>
            <ButtonLink href="/records/new" variant="primary">
              Key in a record
            </ButtonLink>
          </>
        }
      />

      {stats.records === 0 ? (
        <div className="panel">
          <EmptyState
            title="No build records yet"
            actions={
              stats.sources === 0 ? (
                <ButtonLink href="/sources/new" variant="primary">
                  Add the first source
                </ButtonLink>
              ) : (
                <>
                  <ButtonLink href="/records/new" variant="primary">
                    Key in the first record
                  </ButtonLink>
                  <ButtonLink href="/sources">See the {plural(stats.sources, "source")}</ButtonLink>
                </>
              )
            }
          >
            <p>
              Every record comes from a source: a paper, thesis, report or documented shop trial.{" "}
              {stats.sources === 0 ? "Start by adding one, then key in the parameter sets it reports." : "Pick one and key in the parameter sets it reports."}
            </p>
          </EmptyState>
        </div>
      ) : (
        <div className="grid grid--home">
          <Stat className="span-3" label="Build records" value={stats.records} href="/records" />
          <Stat className="span-3" label="Sources" value={stats.sources} href="/sources" />
          <Stat className="span-3" label="Accepted" value={stats.byStatus.accepted ?? 0} href="/records?status=accepted" />
          <Stat className="span-3" label="Waiting for review" value={stats.byStatus.needs_review ?? 0} href="/records?status=needs_review" />

          <div className="span-7 stack">
          <section className="panel" aria-labelledby="by-alloy">
            <div className="panel__title">
              <h2 id="by-alloy">Records by alloy</h2>
              <span className="muted">
                {stats.byAlloy.length > ALLOYS_SHOWN ? `top ${ALLOYS_SHOWN} of ${stats.byAlloy.length} alloys` : plural(stats.byAlloy.length, "alloy")}, by status
              </span>
            </div>
            <BarChart data={alloyBars} title="Records by alloy and status" unit="records" width={640} />
          </section>

          <section className="panel" aria-labelledby="recent">
            <div className="panel__title">
              <h2 id="recent">Recent activity</h2>
              <span className="muted">latest {recent.length} changes</span>
            </div>
            {recent.length === 0 ? (
              <p className="muted">Nothing has changed yet.</p>
            ) : (
              <div className="table-wrap">
                <table className="table">
                  <thead>
                    <tr>
                      <th scope="col">When</th>
                      <th scope="col">Who</th>
                      <th scope="col">What</th>
                      <th scope="col">Reason</th>
                    </tr>
                  </thead>
                  <tbody>
                    {recent.map((e) => (
                      <tr key={e.id}>
                        <td style={{ whiteSpace: "nowrap", fontVariantNumeric: "tabular-nums" }}>
                          {formatDateTime(e.at)}
                        </td>
                        <td>{e.actorName}</td>
                        <td>
                          <EntityLink type={e.entityType} id={e.entityId} /> {ACTION_VERB[e.action] ?? e.action.replace(/_/g, " ")}
                        </td>
                        <td className="muted">{e.reason ?? ""}</td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              </div>
            )}
                    </section>
          </div>

          <div className="span-5 stack">
          <section className="panel" aria-labelledby="by-status">
            <div className="panel__title">
              <h2 id="by-status">Records by status</h2>
            </div>
            <BarChart data={statusBars} title="Records by status" unit="records" width={460} />
            <div className="panel__title" style={{ marginTop: "1.25rem" }}>
              <h2 id="by-outcome">Records by outcome</h2>
            </div>
            <BarChart data={outcomeBars} title="Records by outcome" unit="records" width={460} />
          </section>

          <section className="panel" aria-labelledby="open-flags">
            <div className="panel__title">
              <h2 id="open-flags">Open flags</h2>
              <span className="muted">on {plural(flags.records, "record")}</span>
            </div>
            {flags.records === 0 ? (
              <p className="muted">No open flags: every check passes or was worked off.</p>
            ) : (
              <>
                <ul className="link-list" aria-label="Open flags by severity">
                  {(["error", "warning", "info"] as const).map((severity) => (
                    <li key={severity}>
                      <Link href="/review" className="next-step">
                        <span>
                          <SeverityBadge severity={severity} /> <span className="next-step__title">{formatNumber(flags.bySeverity[severity] ?? 0, 0)}</span>
                        </span>
                      </Link>
                    </li>
                  ))}
                </ul>
                <p className="muted" style={{ marginTop: "0.75rem" }}>
                  Most frequent: {flags.byRule.slice(0, 3).map((r) => `${r.ruleCode} (${formatNumber(r.count, 0)})`).join(", ")}. <Link href="/review">Open the review queue</Link>.
                </p>
              </>
            )}
          </section>

          <section className="panel" aria-labelledby="next">
            <div className="panel__title">
              <h2 id="next">Where to go next</h2>
            </div>
            <ul className="link-list">
              <NextStep href="/records/new" title="Key in a record" text="Enter a parameter set from a table or figure, with units as the source wrote them." />
              <NextStep href="/sources/new" title="Add a source" text="A paper, thesis, report or shop trial; a DOI already in the collection is caught." />
              <NextStep href="/records?status=needs_review" title="Records waiting for review" text={`${formatNumber(stats.byStatus.needs_review ?? 0, 0)} records were entered or edited and not yet accepted.`} />
              <NextStep href="/records" title="Browse all records" text="Filter by alloy, source, outcome and parameter ranges; sort any column." />
            </ul>
          </section>
          </div>
        </div>
      )}
    </>
  );
}

function Stat({ label, value, href, className }: { label: string; value: number; href: string; className: string }) {
  return (
    <Link href={href} className={`panel stat ${className}`} style={{ textDecoration: "none", color: "inherit" }}>
      <span className="stat__value">{formatNumber(value, 0)}</span>
      <span className="stat__label">{label}</span>
    </Link>
  );
}

function NextStep({ href, title, text }: { href: string; title: string; text: string }) {
  return (
    <li>
      <Link href={href} className="next-step">
        <span>
          <span className="next-step__title">{title}</span>
          <span className="next-step__text">{text}</span>
        </span>
      </Link>
    </li>
  );
}

function EntityLink({ type, id }: { type: string; id: string }) {
  if (type === "record") return <Link href={`/records/${id}`}>Record {id}</Link>;
  if (type === "source") return <Link href={`/sources/${id}`}>Source {id}</Link>;
  if (type === "record_batch") return <Link href="/records">Records {id.replace("-", "–")}</Link>;
  return (
    <span>
      {type} {id}
    </span>
  );
}
