"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useCallback, useEffect, useMemo, useRef, useState, useTransition, type FormEvent, type KeyboardEvent as ReactKeyboardEvent } from "react";
import type { QueueFlagView, QueueItem, ReviewQueue } from "@/lib/server/review-queue";
import { Alert } from "../../_components/alert";
import { Button, ButtonLink } from "../../_components/button";
import { EmptyState } from "../../_components/empty-state";
import { formatNumber } from "../../_components/format";
import { OutcomeLabel } from "../../_components/outcome-label";
import { SeverityBadge, StatusBadge } from "../../_components/status-badge";
import { acceptRecordAction, bulkFlagAction, flagActionAction, type ReviewActionState } from "../actions";
import { PairView } from "./pair-view";

type Mode =
  | { kind: "waive" | "reject" | "distinct" | "merge" }
  | { kind: "fix" }
  | { kind: "bulk"; action: "waive" | "fix" };

interface Entry {
  item: QueueItem;
  flag: QueueFlagView;
}

/** The shortcuts, as the help panel lists them. */
const SHORTCUTS: [string, string][] = [
  ["j / ↓", "next flag"],
  ["k / ↑", "previous flag"],
  ["n / p", "next / previous record"],
  ["f", "fix the value (suggested fix filled in)"],
  ["w", "waive the flag, with a reason"],
  ["r", "reject the record, with a reason"],
  ["m", "merge the duplicate into the earlier record"],
  ["d", "mark the pair distinct, with a reason"],
  ["a", "accept the record (no open errors left)"],
  ["x", "select or unselect the flag"],
  ["W / F", "waive / apply the suggested fix on every selected flag"],
  ["Enter / Esc", "confirm / cancel the open form"],
  ["?", "show or hide these shortcuts"],
];

const REASON_LABEL: Record<string, string> = {
  waive: "Why is the value right as it is?",
  reject: "Why is the record rejected?",
  distinct: "Why are the two records different builds?",
  merge: "Note on the merge (optional)",
};

function isTyping(target: EventTarget | null): boolean {
  if (!(target instanceof HTMLElement)) return false;
  return target.isContentEditable || ["INPUT", "TEXTAREA", "SELECT"].includes(target.tagName);
}

/** The queue: flags of the page in order, one of them current, every action on a key. */
export function ReviewQueueView({ queue }: { queue: ReviewQueue }) {
  const router = useRouter();
  const entries: Entry[] = useMemo(() => queue.items.flatMap((item) => item.flags.map((flag) => ({ item, flag }))), [queue]);
  const [current, setCurrent] = useState(0);
  const [mode, setMode] = useState<Mode | null>(null);
  const [selected, setSelected] = useState<Set<number>>(() => new Set());
  const [help, setHelp] = useState(false);
  const [notice, setNotice] = useState<string>("");
  const [error, setError] = useState<ReviewActionState & { ok: false } | null>(null);
  const [pending, startTransition] = useTransition();
  const cards = useRef<(HTMLElement | null)[]>([]);
  const index = Math.min(current, Math.max(0, entries.length - 1));
  const entry = entries[index];

  // Keep the current flag in view and focused when it or the data changes.
  useEffect(() => {
    if (mode) return;
    const focus = () => {
      const el = cards.current[index];
      if (el && document.activeElement !== el && !isTyping(document.activeElement)) el.focus({ preventScroll: false });
    };
    focus();
    // The router may move focus after a navigation or refresh settles; take it back once more.
    const frame = requestAnimationFrame(focus);
    return () => cancelAnimationFrame(frame);
  }, [index, queue, mode]);

  // Selections of flags that are gone are dropped.
  useEffect(() => {
    setSelected((s) => {
      const ids = new Set(entries.map((e) => e.flag.id));
      const next = new Set([...s].filter((id) => ids.has(id)));
      return next.size === s.size ? s : next;
    });
  }, [entries]);

  const finish = useCallback(
    (r: ReviewActionState) => {
      if (r.ok) {
        setNotice(r.message);
        setError(null);
        setMode(null);
        router.refresh();
      } else {
        setError(r);
        setNotice("");
      }
    },
    [router],
  );

  // The result is applied inside a transition of its own: React only treats updates after an await
  // as part of the transition when wrapped again, and otherwise shows the outcome while the form
  // still counts as pending (its submit button disabled, so Enter would do nothing).
  const run = useCallback(
    (f: () => Promise<ReviewActionState>) =>
      startTransition(async () => {
        const r = await f();
        startTransition(() => finish(r));
      }),
    [finish],
  );

  const accept = useCallback(() => {
    if (!entry) return;
    run(() => acceptRecordAction({ recordId: entry.item.record.id, version: entry.item.record.version }));
  }, [entry, run]);

  const move = useCallback(
    (delta: number) => {
      setError(null);
      setCurrent((c) => Math.max(0, Math.min(entries.length - 1, Math.min(c, entries.length - 1) + delta)));
    },
    [entries.length],
  );

  const moveRecord = useCallback(
    (delta: number) => {
      if (!entry) return;
      setError(null);
      const recordId = entry.item.record.id;
      if (delta > 0) {
        const next = entries.findIndex((e, i) => i > index && e.item.record.id !== recordId);
        if (next >= 0) setCurrent(next);
      } else {
        let i = index;
        while (i > 0 && entries[i - 1]!.item.record.id === recordId) i--;
        if (i > 0) {
          const prevRecord = entries[i - 1]!.item.record.id;
          let j = i - 1;
          while (j > 0 && entries[j - 1]!.item.record.id === prevRecord) j--;
          setCurrent(j);
        }
      }
    },
    [entries, entry, index],
  );

  useEffect(() => {
    function onKey(e: KeyboardEvent) {
      if (e.ctrlKey || e.metaKey || e.altKey || isTyping(e.target) || pending) return;
      const key = e.key;
      const handled = (() => {
        if (key === "?") return setHelp((h) => !h), true;
        if (key === "Escape") return setMode(null), setError(null), setHelp(false), true;
        if (!entry) return false;
        switch (key) {
          case "j":
          case "ArrowDown":
            return move(1), true;
          case "k":
          case "ArrowUp":
            return move(-1), true;
          case "n":
            return moveRecord(1), true;
          case "p":
            return moveRecord(-1), true;
          case "w":
            return setMode({ kind: "waive" }), true;
          case "r":
            return setMode({ kind: "reject" }), true;
          case "f":
            return setMode({ kind: "fix" }), true;
          case "m":
            if (!entry.flag.isPair) return setError({ ok: false, error: { code: "invalid_input", message: "Merge applies to duplicate and conflict flags only." } }), true;
            return setMode({ kind: "merge" }), true;
          case "d":
            if (!entry.flag.isPair) return setError({ ok: false, error: { code: "invalid_input", message: "Distinct applies to duplicate and conflict flags only." } }), true;
            return setMode({ kind: "distinct" }), true;
          case "a":
            return accept(), true;
          case "x":
            return (
              setSelected((s) => {
                const next = new Set(s);
                if (next.has(entry.flag.id)) next.delete(entry.flag.id);
                else next.add(entry.flag.id);
                return next;
              }),
              true
            );
          case "W":
            if (!selected.size) return setError({ ok: false, error: { code: "invalid_input", message: "Select flags with x first." } }), true;
            return setMode({ kind: "bulk", action: "waive" }), true;
          case "F":
            if (!selected.size) return setError({ ok: false, error: { code: "invalid_input", message: "Select flags with x first." } }), true;
            return setMode({ kind: "bulk", action: "fix" }), true;
          default:
            return false;
        }
      })();
      if (handled) e.preventDefault();
    }
    window.addEventListener("keydown", onKey);
    return () => window.removeEventListener("keydown", onKey);
  }, [accept, entry, move, moveRecord, pending, selected]);

  if (!entries.length) {
    return (
      <div>
        {notice ? <Alert tone="info" title={notice} /> : null}
        <EmptyState title={queue.filter.code || queue.filter.sourceId ? "No open flags match this filter" : "No open flags"} actions={<ButtonLink href="/records">Go to the records</ButtonLink>}>
          <p className="muted">Every check finding has been worked off{queue.filter.code || queue.filter.sourceId ? " for this filter" : ""}.</p>
        </EmptyState>
      </div>
    );
  }

  const selectedEntries = entries.filter((e) => selected.has(e.flag.id));
  let cardIndex = 0;
  return (
    <div className="review-main">
      <div className="review-status" aria-live="polite" role="status">
        {notice ? <span className="review-status__notice">{notice}</span> : null}
        <span className="muted">
          Flag {index + 1} of {entries.length} on this page · {queue.total.toLocaleString("en-US")} record{queue.total === 1 ? "" : "s"} in the queue
          {selected.size ? ` · ${selected.size} selected` : ""}
        </span>
        <Button size="small" variant="ghost" onClick={() => setHelp((h) => !h)} aria-expanded={help}>
          Shortcuts (?)
        </Button>
      </div>
      {help ? (
        <section className="panel review-help" aria-label="Keyboard shortcuts">
          <dl>
            {SHORTCUTS.map(([k, what]) => (
              <div key={k}>
                <dt>
                  <kbd>{k}</kbd>
                </dt>
                <dd>{what}</dd>
              </div>
            ))}
          </dl>
        </section>
      ) : null}
      {error && !mode ? (
        <Alert tone="error" title={error.error.code === "conflict" ? "Someone else acted first, or the action does not apply" : "That did not work"}>
          <p>{error.error.message}</p>
        </Alert>
      ) : null}
      {mode?.kind === "bulk" ? (
        <BulkForm
          action={mode.action}
          count={selectedEntries.length}
          pending={pending}
          error={error}
          onCancel={() => {
            setMode(null);
            setError(null);
          }}
          onSubmit={(reason) => run(() => bulkFlagAction({ items: selectedEntries.map((e) => ({ flagId: e.flag.id, version: e.flag.version })), action: mode.action, reason }))}
        />
      ) : null}
      {queue.items.map((item) => {
        const r = item.record;
        return (
          <section key={r.id} className="panel review-record" aria-labelledby={`record-${r.id}`}>
            <header className="review-record__header">
              <div>
                <h2 id={`record-${r.id}`}>
                  <Link href={`/records/${r.id}`}>Record #{r.id}</Link> · {r.alloyKey}
                  {r.designation && r.designation !== r.alloyKey ? <span className="muted"> (as entered: {r.designation})</span> : null}
                </h2>
                <p className="review-record__source">
                  <Link href={`/sources/${r.source.id}`}>
                    {r.source.year ?? "n.d."} · {r.source.title}
                  </Link>
                  {r.source.doi ? <span className="mono"> · doi {r.source.doi}</span> : null}
                  {r.locationLabel || r.locationPage ? <span> · {[r.locationLabel, r.locationPage ? `page ${r.locationPage}` : null].filter(Boolean).join(", ")}</span> : null}
                  {r.importFile ? (
                    <span className="mono">
                      {" "}
                      · {r.importFile}
                      {r.importRow ? ` row ${r.importRow}` : ""}
                    </span>
                  ) : null}
                </p>
              </div>
              <div className="review-record__meta">
                <StatusBadge status={r.status} />
                <OutcomeLabel outcome={r.outcome} />
                <span className="muted num">quality {formatNumber(r.qualityScore, 2)}</span>
              </div>
            </header>
            <div className="review-record__body">
              <table className="table review-values">
                <caption className="visually-hidden">Values of record {r.id} as entered and as stored</caption>
                <thead>
                  <tr>
                    <th scope="col">Value</th>
                    <th scope="col">As entered</th>
                    <th scope="col">Stored (canonical)</th>
                  </tr>
                </thead>
                <tbody>
                  {r.values.map((v) => (
                    <tr key={v.field}>
                      <th scope="row">{v.label}</th>
                      <td className="num">
                        {v.entered ? `${v.entered.text} ${v.entered.unit}` : "—"}
                        {v.entered && v.entered.provenance !== "reported" ? <span className="muted"> ({v.entered.provenance})</span> : null}
                      </td>
                      <td className="num">
                        {formatNumber(v.canonical, 4)} {v.canonical !== null ? v.unit : ""}
                      </td>
                    </tr>
                  ))}
                  <tr>
                    <th scope="row">E_v (derived)</th>
                    <td>—</td>
                    <td className="num">{formatNumber(r.volumetricEnergyJMm3, 1)} J/mm³</td>
                  </tr>
                </tbody>
              </table>
              <ol className="review-flags">
                {item.flags.map((flag) => {
                  const i = cardIndex++;
                  const isCurrent = i === index;
                  return (
                    <li
                      key={flag.id}
                      ref={(el) => {
                        cards.current[i] = el;
                      }}
                      tabIndex={-1}
                      className={["review-flag", isCurrent ? "review-flag--current" : "", selected.has(flag.id) ? "review-flag--selected" : ""].filter(Boolean).join(" ")}
                      aria-current={isCurrent ? "true" : undefined}
                      aria-label={`Flag ${flag.id}: ${flag.title}`}
                      data-flag-id={flag.id}
                      onClick={() => setCurrent(i)}
                    >
                      <div className="review-flag__head">
                        <SeverityBadge severity={flag.severity} />
                        <strong>{flag.title}</strong>
                        <code className="muted">{flag.ruleCode}</code>
                        <span className="muted">#{flag.id}</span>
                        {selected.has(flag.id) ? <span className="review-flag__selected">selected</span> : null}
                      </div>
                      <p className="review-flag__message">{flag.message}</p>
                      <details>
                        <summary>Why this rule, and the numbers behind it</summary>
                        <p>{flag.explanation}</p>
                        <p className="muted">Rests on: {flag.ruleSource}</p>
                        <FlagNumbers flag={flag} />
                      </details>
                      {flag.isPair && flag.relatedRecordId !== null && item.related[flag.relatedRecordId] ? <PairView record={r} other={item.related[flag.relatedRecordId]!} /> : null}
                      {isCurrent && mode && mode.kind !== "bulk" ? (
                        mode.kind === "fix" ? (
                          <FixForm
                            entry={{ item, flag }}
                            pending={pending}
                            error={error}
                            onCancel={() => {
                              setMode(null);
                              setError(null);
                            }}
                            onSubmit={(fix, reason) => run(() => flagActionAction({ flagId: flag.id, version: flag.version, recordVersion: r.version, action: "fix", reason, fix }))}
                          />
                        ) : (
                          <ReasonForm
                            kind={mode.kind}
                            pending={pending}
                            error={error}
                            onCancel={() => {
                              setMode(null);
                              setError(null);
                            }}
                            onSubmit={(reason) => run(() => flagActionAction({ flagId: flag.id, version: flag.version, recordVersion: r.version, action: mode.kind, reason }))}
                          />
                        )
                      ) : null}
                      <div className="review-flag__actions">
                        <Button size="small" onClick={() => (setCurrent(i), setMode({ kind: "fix" }))}>
                          Fix <kbd>f</kbd>
                        </Button>
                        <Button size="small" onClick={() => (setCurrent(i), setMode({ kind: "waive" }))}>
                          Waive <kbd>w</kbd>
                        </Button>
                        {flag.isPair ? (
                          <>
                            <Button size="small" onClick={() => (setCurrent(i), setMode({ kind: "merge" }))}>
                              Merge <kbd>m</kbd>
                            </Button>
                            <Button size="small" onClick={() => (setCurrent(i), setMode({ kind: "distinct" }))}>
                              Distinct <kbd>d</kbd>
                            </Button>
                          </>
                        ) : null}
                        <Button size="small" variant="danger" onClick={() => (setCurrent(i), setMode({ kind: "reject" }))}>
                          Reject record <kbd>r</kbd>
                        </Button>
                        <Button size="small" variant="ghost" onClick={() => (setCurrent(i), accept())}>
                          Accept record <kbd>a</kbd>
                        </Button>
                      </div>
                    </li>
                  );
                })}
              </ol>
            </div>
          </section>
        );
      })}
      <nav className="review-pages" aria-label="Queue pages">
        {queue.page > 0 ? <ButtonLink href={pageHref(queue, queue.page - 1)}>Previous page</ButtonLink> : null}
        {(queue.page + 1) * queue.pageSize < queue.total ? <ButtonLink href={pageHref(queue, queue.page + 1)}>Next page</ButtonLink> : null}
      </nav>
    </div>
  );
}

function pageHref(q: ReviewQueue, page: number): string {
  const p = new URLSearchParams();
  if (q.filter.code) p.set("code", q.filter.code);
  if (q.filter.sourceId) p.set("source", String(q.filter.sourceId));
  if (page) p.set("page", String(page));
  const s = p.toString();
  return s ? `/review?${s}` : "/review";
}

function FlagNumbers({ flag }: { flag: QueueFlagView }) {
  const d = flag.details as { inputs?: Record<string, unknown>; thresholds?: Record<string, unknown>; criteria?: { name: string; value: number | null; threshold: number | null; margin: number | null; mode: string }[] };
  return (
    <dl className="review-numbers">
      {d.inputs ? (
        <>
          <dt>Inputs</dt>
          <dd className="mono">{Object.entries(d.inputs).map(([k, v]) => `${k} = ${v === null ? "—" : String(v)}`).join("; ")}</dd>
        </>
      ) : null}
      {d.thresholds ? (
        <>
          <dt>Thresholds</dt>
          <dd className="mono">{Object.entries(d.thresholds).map(([k, v]) => `${k} = ${String(v)}`).join("; ")}</dd>
        </>
      ) : null}
      {d.criteria ? (
        <>
          <dt>Criteria</dt>
          <dd>
            <ul>
              {d.criteria.map((c) => (
                <li key={c.name} className="mono">
                  {c.mode}: {c.name} — value {c.value ?? "—"}, threshold {c.threshold ?? "—"}, margin {c.margin === null ? "—" : `${Math.round(c.margin * 100)} %`}
                </li>
              ))}
            </ul>
          </dd>
        </>
      ) : null}
      {flag.settingsVersion ? (
        <>
          <dt>Settings version</dt>
          <dd>{flag.settingsVersion}</dd>
        </>
      ) : null}
    </dl>
  );
}

function onEscape(cancel: () => void) {
  return (e: ReactKeyboardEvent) => {
    if (e.key === "Escape") {
      e.preventDefault();
      e.stopPropagation();
      cancel();
    }
  };
}

function ReasonForm({ kind, pending, error, onCancel, onSubmit }: { kind: string; pending: boolean; error: (ReviewActionState & { ok: false }) | null; onCancel: () => void; onSubmit: (reason: string) => void }) {
  const [reason, setReason] = useState("");
  const id = `reason-${kind}`;
  const message = error?.error.details?.fieldErrors?.reason?.[0] ?? error?.error.message;
  function submit(e: FormEvent) {
    e.preventDefault();
    onSubmit(reason);
  }
  return (
    <form className="review-form" onSubmit={submit} onKeyDown={onEscape(onCancel)} aria-label={`${kind} the flag`}>
      <label htmlFor={id} className="field__label">
        {REASON_LABEL[kind] ?? "Reason"}
      </label>
      <div className="review-form__row">
        <input id={id} className="input" autoFocus value={reason} onChange={(e) => setReason(e.target.value)} aria-invalid={Boolean(message) || undefined} aria-describedby={message ? `${id}-error` : undefined} />
        <Button type="submit" variant={kind === "reject" ? "danger" : "primary"} size="small" disabled={pending}>
          {pending ? "Saving…" : kind === "reject" ? "Reject record" : kind === "merge" ? "Merge" : kind === "distinct" ? "Mark distinct" : "Waive"}
        </Button>
        <Button size="small" variant="ghost" onClick={onCancel}>
          Cancel (Esc)
        </Button>
      </div>
      {message ? (
        <p className="field__error" id={`${id}-error`} role="alert">
          {message}
        </p>
      ) : null}
    </form>
  );
}

function FixForm({ entry, pending, error, onCancel, onSubmit }: { entry: Entry; pending: boolean; error: (ReviewActionState & { ok: false }) | null; onCancel: () => void; onSubmit: (fix: { field: string; value: string; unit: string }, reason: string) => void }) {
  const { item, flag } = entry;
  const detailField = typeof flag.details.field === "string" ? flag.details.field : null;
  const initialField = flag.suggestedFix?.field ?? detailField ?? item.record.values[0]?.field ?? "laserPower";
  const enteredOf = (field: string) => item.record.values.find((v) => v.field === field)?.entered ?? null;
  const [field, setField] = useState(initialField);
  const [value, setValue] = useState(flag.suggestedFix?.value ?? enteredOf(initialField)?.text ?? "");
  const [unit, setUnit] = useState(flag.suggestedFix?.unit ?? enteredOf(initialField)?.unit ?? "");
  const [reason, setReason] = useState("");
  const fieldErrors = error?.error.details?.fieldErrors ?? {};
  const message = fieldErrors["fix.value"]?.[0] ?? (error ? error.error.message : null);
  function submit(e: FormEvent) {
    e.preventDefault();
    onSubmit({ field, value, unit }, reason);
  }
  return (
    <form className="review-form" onSubmit={submit} onKeyDown={onEscape(onCancel)} aria-label="Fix the value">
      <div className="review-form__row">
        <label className="field">
          <span className="field__label">Field</span>
          <select
            className="select"
            value={field}
            onChange={(e) => {
              setField(e.target.value);
              setValue(enteredOf(e.target.value)?.text ?? "");
              setUnit(enteredOf(e.target.value)?.unit ?? "");
            }}
          >
            {item.record.values.map((v) => (
              <option key={v.field} value={v.field}>
                {v.label}
              </option>
            ))}
          </select>
        </label>
        <label className="field">
          <span className="field__label">Value</span>
          <input className="input" autoFocus value={value} onChange={(e) => setValue(e.target.value)} aria-invalid={Boolean(message) || undefined} />
        </label>
        <label className="field">
          <span className="field__label">Unit</span>
          <input className="input review-form__unit" value={unit} onChange={(e) => setUnit(e.target.value)} />
        </label>
        <label className="field review-form__grow">
          <span className="field__label">
            Note <span className="field__optional">(optional)</span>
          </span>
          <input className="input" value={reason} onChange={(e) => setReason(e.target.value)} />
        </label>
        <Button type="submit" variant="primary" size="small" disabled={pending}>
          {pending ? "Saving…" : "Save the fix"}
        </Button>
        <Button size="small" variant="ghost" onClick={onCancel}>
          Cancel (Esc)
        </Button>
      </div>
      {flag.suggestedFix ? <p className="field__hint">Suggested: {flag.suggestedFix.value} {flag.suggestedFix.unit}. Enter saves it; the checks run again at once.</p> : null}
      {message ? (
        <p className="field__error" role="alert">
          {message}
        </p>
      ) : null}
    </form>
  );
}

function BulkForm({ action, count, pending, error, onCancel, onSubmit }: { action: "waive" | "fix"; count: number; pending: boolean; error: (ReviewActionState & { ok: false }) | null; onCancel: () => void; onSubmit: (reason: string) => void }) {
  const [reason, setReason] = useState("");
  const message = error?.error.details?.fieldErrors?.reason?.[0] ?? error?.error.message;
  return (
    <form
      className="panel review-form"
      onSubmit={(e) => {
        e.preventDefault();
        onSubmit(reason);
      }}
      onKeyDown={onEscape(onCancel)}
      aria-label={`${action} ${count} selected flags`}
    >
      <label htmlFor="bulk-reason" className="field__label">
        {action === "waive" ? `Waive ${count} selected flag${count === 1 ? "" : "s"}: why?` : `Apply the suggested fix to ${count} selected flag${count === 1 ? "" : "s"} (note, optional)`}
      </label>
      <div className="review-form__row">
        <input id="bulk-reason" className="input" autoFocus value={reason} onChange={(e) => setReason(e.target.value)} />
        <Button type="submit" variant="primary" size="small" disabled={pending}>
          {pending ? "Saving…" : action === "waive" ? "Waive all" : "Fix all"}
        </Button>
        <Button size="small" variant="ghost" onClick={onCancel}>
          Cancel (Esc)
        </Button>
      </div>
      {message ? (
        <p className="field__error" role="alert">
          {message}
        </p>
      ) : null}
    </form>
  );
}
