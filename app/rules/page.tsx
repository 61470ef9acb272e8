import { getCheckSettings } from "@/lib/server/check-settings";
import { Alert } from "../_components/alert";
import { formatDateTime } from "../_components/format";
import { LoadError } from "../_components/load-error";
import { PageHeader } from "../_components/page-header";
import { SeverityBadge } from "../_components/status-badge";
import { SettingsForm } from "./_components/settings-form";
import { saveCheckSettingsAction } from "./actions";
import "./rules.css";

export const dynamic = "force-dynamic";
export const metadata = { title: "Check rules" };

const GROUP_TITLE: Record<string, string> = {
  limit: "Hard limits",
  unit_slip: "Unit slips",
  range: "Plausible ranges",
  powder: "Powder",
  geometry: "Spot and hatch",
  energy: "Energy density",
  alloy: "Alloy",
  composition: "Composition",
  assumed: "Assumed values",
  physics: "Outcome versus physics",
  duplicate: "Duplicates",
  neighbours: "Neighbours",
};

type Props = { searchParams: Promise<{ saved?: string }> };

export default async function RulesPage({ searchParams }: Props) {
  const { saved } = await searchParams;
  const result = await getCheckSettings();
  if (!result.ok) return <LoadError error={result.error} what="the check rules" />;
  const { current, defs, versions, rules: catalogue } = result.data;
  const defByKey = new Map(defs.map((d) => [d.key, d]));
  const groups = new Map<string, (typeof catalogue)[number][]>();
  for (const r of catalogue) {
    const g = r.code.split(".")[0]!;
    groups.set(g, [...(groups.get(g) ?? []), r]);
  }
  return (
    <>
      <PageHeader
        eyebrow="Review"
        title="Check rules"
        description={`Every rule the checks run, what it rests on and the thresholds it reads now (settings version ${current.version}). Thresholds are versioned: each flag records the version it was raised under, so a re-run with that version reproduces it.`}
      />
      {saved ? <Alert tone="info" title={`Settings version ${saved} saved`}>Run the checks (meltledger check --all) to apply it to every record; saves and imports use it at once.</Alert> : null}
      <nav className="rules-toc panel" aria-label="Rule groups">
        {[...groups.keys()].map((g) => (
          <a key={g} href={`#rules-${g}`}>
            {GROUP_TITLE[g] ?? g}
          </a>
        ))}
        <a href="#settings">Thresholds and weights</a>
      </nav>
      {[...groups.entries()].map(([g, rules]) => (
        <section key={g} className="panel" aria-labelledby={`rules-${g}`}>
          <div className="panel__title">
            <h2 id={`rules-${g}`}>{GROUP_TITLE[g] ?? g}</h2>
            <span className="muted">{rules.length} rule{rules.length === 1 ? "" : "s"}</span>
          </div>
          <div className="table-wrap">
            <table className="table rules-table">
              <thead>
                <tr>
                  <th scope="col">Rule</th>
                  <th scope="col">Severity</th>
                  <th scope="col">What it checks and how to resolve it</th>
                  <th scope="col">Rests on</th>
                  <th scope="col">Current thresholds</th>
                </tr>
              </thead>
              <tbody>
                {rules.map((r) => (
                  <tr key={r.code} id={`rule-${r.code}`}>
                    <td>
                      <strong>{r.title}</strong>
                      <div>
                        <code className="muted">{r.code}</code>
                      </div>
                    </td>
                    <td>
                      <SeverityBadge severity={r.severity} />
                    </td>
                    <td>{r.description}</td>
                    <td className="rules-source">{r.source}</td>
                    <td>
                      {r.thresholdKeys.length ? (
                        <ul className="rules-thresholds">
                          {r.thresholdKeys.map((k) => {
                            const d = defByKey.get(k);
                            return (
                              <li key={k}>
                                <a href={`#setting-${k}`}>{d?.label ?? k}</a>: <span className="num">{current.values[k]}</span> {d?.unit}
                              </li>
                            );
                          })}
                        </ul>
                      ) : (
                        <span className="muted">fixed (physical or definitional)</span>
                      )}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </section>
      ))}
      <section className="panel" aria-labelledby="settings">
        <div className="panel__title">
          <h2 id="settings">Thresholds and weights</h2>
          <span className="muted">
            version {current.version}
            {current.createdByName ? ` by ${current.createdByName}` : " (defaults)"} · {formatDateTime(current.createdAt)}
          </span>
        </div>
        <SettingsForm defs={defs} values={current.values} version={current.version} action={saveCheckSettingsAction} />
      </section>
      <section className="panel" aria-labelledby="versions">
        <div className="panel__title">
          <h2 id="versions">Versions</h2>
        </div>
        <ol className="rules-versions">
          {versions.map((v) => (
            <li key={v.version}>
              <strong>Version {v.version}</strong> · {formatDateTime(v.createdAt)} · {v.createdByName ?? "defaults"}
              {v.changed.length ? <div className="mono muted">{v.changed.join("; ")}</div> : <div className="muted">the defaults</div>}
            </li>
          ))}
        </ol>
      </section>
    </>
  );
}
