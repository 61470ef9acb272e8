import Link from "next/link";
import type { ReviewQueue } from "@/lib/server/review-queue";
import { SeverityBadge } from "../../_components/status-badge";

function href(filter: { code?: string | null; source?: number | null }): string {
  const p = new URLSearchParams();
  if (filter.code) p.set("code", filter.code);
  if (filter.source) p.set("source", String(filter.source));
  const s = p.toString();
  return s ? `/review?${s}` : "/review";
}

/** Counts of open flags by severity, rule and source, each a filter of the queue. */
export function QueueSidebar({ counts, ruleTitles, filter }: { counts: ReviewQueue["counts"]; ruleTitles: Record<string, string>; filter: { code: string | null; sourceId: number | null } }) {
  return (
    <aside className="review-sidebar" aria-label="Open flags by rule and by source">
      <section className="panel">
        <div className="panel__title">
          <h2>Open flags</h2>
          {filter.code || filter.sourceId ? <Link href="/review">Clear filter</Link> : null}
        </div>
        <ul className="count-list">
          {(["error", "warning", "info"] as const).map((s) => (
            <li key={s}>
              <SeverityBadge severity={s} />
              <span className="num">{(counts.bySeverity[s] ?? 0).toLocaleString("en-US")}</span>
            </li>
          ))}
        </ul>
      </section>
      <section className="panel">
        <div className="panel__title">
          <h2>By rule</h2>
        </div>
        <ul className="count-list">
          {counts.byRule.map((r) => (
            <li key={`${r.ruleCode}-${r.severity}`}>
              <Link href={href({ code: r.ruleCode, source: filter.sourceId })} aria-current={filter.code === r.ruleCode ? "true" : undefined} title={r.ruleCode}>
                {ruleTitles[r.ruleCode] ?? r.ruleCode}
              </Link>
              <span className="num">{r.count.toLocaleString("en-US")}</span>
            </li>
          ))}
        </ul>
      </section>
      <section className="panel">
        <div className="panel__title">
          <h2>By source</h2>
        </div>
        <ul className="count-list">
          {counts.bySource.map((s) => (
            <li key={s.sourceId ?? "none"}>
              {s.sourceId ? (
                <Link href={href({ code: filter.code, source: s.sourceId })} aria-current={filter.sourceId === s.sourceId ? "true" : undefined} title={s.title ?? ""}>
                  {s.title ?? `Source ${s.sourceId}`}
                </Link>
              ) : (
                <span className="count-list__label">No source</span>
              )}
              <span className="num">{s.count.toLocaleString("en-US")}</span>
            </li>
          ))}
        </ul>
      </section>
    </aside>
  );
}
