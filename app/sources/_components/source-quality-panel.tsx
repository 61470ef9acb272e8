import { getSourceQuality } from "@/lib/server/source-quality";
import { formatNumber } from "../../_components/format";
import { LoadError } from "../../_components/load-error";
import { ProgressBar } from "../../_components/progress-bar";
import { SourceQualityOverrideForm } from "./source-quality-override-form";
import { sourceQualityOverrideAction } from "./source-quality-actions";

/** The source's quality score explained in words, with the reviewer's override. */
export async function SourceQualityPanel({ sourceId }: { sourceId: number }) {
  const r = await getSourceQuality(sourceId);
  if (!r.ok) return <LoadError error={r.error} what="the quality of this source" />;
  const q = r.data;
  return (
    <section className="panel" aria-labelledby="quality">
      <div className="panel__title">
        <h2 id="quality">Source quality</h2>
        <span className="muted">settings version {q.settingsVersion}</span>
      </div>
      <p className="stat">
        <span className="stat__value">{Math.round(q.score * 100)}%</span>
        <span className="stat__label">{q.overridden ? `set by ${q.overriddenBy ?? "a reviewer"} (computed: ${Math.round(q.computedScore * 100)}%)` : "computed from what a reviewer can verify"}</span>
      </p>
      <p>{q.explanation}</p>
      <ul className="link-list">
        {q.parts.map((p) => (
          <li key={p.part}>
            <ProgressBar label={`${p.label} — weight ${formatNumber(p.weight, 2)}`} value={p.score} max={1} detail={`score ${p.score.toFixed(2)}`} />
          </li>
        ))}
      </ul>
      <p className="muted">
        Each record&apos;s quality is this score times the completeness of its own fields (reported, derived or assumed).
        {q.records ? ` Mean record quality over its ${q.records} record${q.records === 1 ? "" : "s"}: ${q.meanRecordQuality === null ? "not computed yet" : q.meanRecordQuality.toFixed(2)}.` : ""}
      </p>
      <SourceQualityOverrideForm sourceId={q.sourceId} version={q.version} overridden={q.overridden} score={q.overridden ? q.score : null} reason={q.overrideReason} action={sourceQualityOverrideAction} />
    </section>
  );
}
