import { diffSnapshots } from "./audit-diff";
import { formatDateTime, plural } from "./format";

/** The fields of an audit event the history needs (a subset of the server's row). */
export interface HistoryEvent {
  id: number;
  actorName: string;
  action: string;
  /** "record_batch" events (imports, the demo seed) cover many records and are summarized. */
  entityType?: string;
  entityId?: string;
  before: unknown;
  after: unknown;
  reason: string | null;
  at: Date | string;
}

const ACTION_LABEL: Record<string, string> = {
  create: "Created",
  update: "Edited",
  reject: "Rejected",
  accept: "Accepted",
  merge: "Merged",
  import: "Imported",
  bulk_create: "Created in a batch",
  seed: "Created by the demo seed",
};

function actionLabel(action: string): string {
  return ACTION_LABEL[action] ?? action.replace(/_/g, " ");
}

/** Every audit event, oldest first, with who, when, what and why, and a before → after table. */
export function AuditHistory({ events, headingLevel = 3 }: { events: readonly HistoryEvent[]; headingLevel?: 2 | 3 }) {
  if (!events.length) return <p className="muted">No history recorded.</p>;
  const Heading = headingLevel === 2 ? "h2" : "h3";
  return (
    <ol className="history">
      {events.map((e) => {
        const batch = e.entityType === "record_batch";
        const changes = batch ? [] : diffSnapshots(e.before, e.after);
        const isCreate = e.before === null || e.before === undefined;
        return (
          <li className="history__event" key={e.id}>
            <div className="history__head">
              <Heading className="history__action" style={{ fontSize: "0.98rem" }}>
                {actionLabel(e.action)}
              </Heading>
              <span className="history__meta">
                by {e.actorName} · <time dateTime={new Date(e.at).toISOString()}>{formatDateTime(e.at)}</time>
              </span>
            </div>
            {e.reason ? (
              <p className="history__reason">
                <span className="muted">Reason:</span> {e.reason}
              </p>
            ) : null}
            {batch ? <p className="history__reason">{batchSummary(e)}</p> : null}
            {changes.length === 0 ? null : isCreate ? (
              <details style={{ marginTop: "0.3rem" }}>
                <summary className="muted" style={{ cursor: "pointer", fontSize: "0.88rem" }}>
                  Values at creation ({changes.length} fields)
                </summary>
                <ChangeTable changes={changes} showBefore={false} />
              </details>
            ) : (
              <ChangeTable changes={changes} showBefore />
            )}
          </li>
        );
      })}
    </ol>
  );
}

function batchSummary(e: HistoryEvent): string {
  const after = (e.after ?? {}) as { count?: unknown; importFile?: unknown };
  const count = typeof after.count === "number" ? after.count.toLocaleString("en-US") : "several";
  const file = typeof after.importFile === "string" && after.importFile ? ` from ${after.importFile}` : "";
  return `Created with ${count} records in one batch${file} (records ${(e.entityId ?? "").replace("-", "–")}).`;
}

function ChangeTable({ changes, showBefore }: { changes: ReturnType<typeof diffSnapshots>; showBefore: boolean }) {
  return (
    <table className="diff">
      <thead className="visually-hidden">
        <tr>
          <th scope="col">Field</th>
          {showBefore ? <th scope="col">Before</th> : null}
          {showBefore ? <th scope="col">Change</th> : null}
          <th scope="col">{showBefore ? "After" : "Value"}</th>
        </tr>
      </thead>
      <tbody>
        {changes.map((c) => (
          <tr key={c.key}>
            <th scope="row">{c.label}</th>
            {showBefore ? <td className={c.before.length > 24 ? "diff__before diff__long" : "diff__before"}>{c.before}</td> : null}
            {showBefore ? (
              <td className="diff__arrow" aria-label="changed to">
                →
              </td>
            ) : null}
            <td className={showBefore ? (c.after.length > 24 ? "diff__after diff__long" : "diff__after") : undefined}>{c.after}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

/** The history panel of an entity page: its heading, the event count, and every event. */
export function HistoryPanel({ events }: { events: readonly HistoryEvent[] }) {
  return (
    <section className="panel" aria-labelledby="history">
      <div className="panel__title">
        <h2 id="history">History</h2>
        <span className="muted">{plural(events.length, "event")}</span>
      </div>
      <AuditHistory events={events} />
    </section>
  );
}
