/** Progress of a known amount (value of max), or indeterminate when `value` is null. */
export function ProgressBar({ label, value, max = 100, detail }: { label: string; value: number | null; max?: number; detail?: string }) {
  const pct = value === null || max <= 0 ? null : Math.max(0, Math.min(100, (value / max) * 100));
  return (
    <div className={pct === null ? "progress progress--indeterminate" : "progress"}>
      <div className="progress__label">
        <span>{label}</span>
        {detail ? <span className="muted num">{detail}</span> : null}
      </div>
      <div
        className="progress__track"
        role="progressbar"
        aria-label={label}
        aria-valuemin={0}
        aria-valuemax={pct === null ? undefined : max}
        aria-valuenow={pct === null ? undefined : (value ?? undefined)}
        aria-valuetext={detail}
      >
        <div className="progress__bar" style={{ width: `${pct ?? 30}%` }} />
      </div>
    </div>
  );
}
