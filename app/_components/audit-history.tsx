import { diffSnapshots } from "./audit-diff";
import { formatDateTime } from "./format";

/** The fields of an audit event the history needs (a subset of the server's row). */
export interface HistoryEvent {
  id: number;
  actorName: string;
  action: string;
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
        const changes = diffSnapshots(e.before, e.after);
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
            {showBefore ? <td className="diff__before">{c.before}</td> : null}
            {showBefore ? (
              <td className="diff__arrow" aria-label="changed to">
                →
              </td>
            ) : null}
            <td className={showBefore ? "diff__after" : undefined}>{c.after}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
