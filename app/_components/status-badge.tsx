import type { ReactNode } from "react";
import { statusLabel } from "./labels";
import { SEVERITY_COLOURS, statusColours } from "./palette";

export { statusLabel };

/** A distinct shape per status so the badge reads without colour. */
function StatusIcon({ status }: { status: string }) {
  const common = { width: 12, height: 12, viewBox: "0 0 12 12", className: "badge__icon", "aria-hidden": true } as const;
  switch (status) {
    case "accepted": // check mark
      return (
        <svg {...common}>
          <path d="M2 6.5 4.8 9.2 10 3" fill="none" stroke="currentColor" strokeWidth="2" strokeLinecap="round" strokeLinejoin="round" />
        </svg>
      );
    case "rejected": // cross
      return (
        <svg {...common}>
          <path d="M3 3l6 6M9 3 3 9" stroke="currentColor" strokeWidth="2" strokeLinecap="round" />
        </svg>
      );
    case "needs_review": // half-filled circle: waiting for a second look
      return (
        <svg {...common}>
          <circle cx="6" cy="6" r="4.5" fill="none" stroke="currentColor" strokeWidth="1.5" />
          <path d="M6 1.5a4.5 4.5 0 0 1 0 9z" fill="currentColor" />
        </svg>
      );
    case "merged": // two paths joining
      return (
        <svg {...common}>
          <path d="M2.5 2v2.5C2.5 7 6 7 6 9.5V11M9.5 2v2.5C9.5 7 6 7 6 9.5" fill="none" stroke="currentColor" strokeWidth="1.5" strokeLinecap="round" />
        </svg>
      );
    default: // draft: dashed circle
      return (
        <svg {...common}>
          <circle cx="6" cy="6" r="4.5" fill="none" stroke="currentColor" strokeWidth="1.5" strokeDasharray="2 1.6" />
        </svg>
      );
  }
}

/** Record status as icon + text on a tint (contrast ≥ 4.5:1). */
export function StatusBadge({ status }: { status: string }) {
  const c = statusColours(status);
  return (
    <span className="badge" style={{ color: c.text, background: c.tint, borderColor: `${c.bar}55` }}>
      <StatusIcon status={status} />
      {statusLabel(status)}
    </span>
  );
}

export type Severity = "error" | "warning" | "info";

const SEVERITY_LABEL: Record<Severity, string> = { error: "Error", warning: "Warning", info: "Info" };

function SeverityIcon({ severity }: { severity: Severity }) {
  const common = { width: 12, height: 12, viewBox: "0 0 12 12", className: "badge__icon", "aria-hidden": true } as const;
  if (severity === "error") {
    // octagon with a bar
    return (
      <svg {...common}>
        <path d="M3.8 0.5h4.4l3.3 3.3v4.4l-3.3 3.3H3.8L0.5 8.2V3.8z" fill="currentColor" />
        <path d="M3.5 6h5" stroke="#fff" strokeWidth="1.6" strokeLinecap="round" />
      </svg>
    );
  }
  if (severity === "warning") {
    // triangle with an exclamation mark
    return (
      <svg {...common}>
        <path d="M6 0.8 11.5 11H0.5z" fill="currentColor" />
        <path d="M6 4.5v3" stroke="#fff" strokeWidth="1.4" strokeLinecap="round" />
        <circle cx="6" cy="9.3" r="0.8" fill="#fff" />
      </svg>
    );
  }
  // circle with an i
  return (
    <svg {...common}>
      <circle cx="6" cy="6" r="5.5" fill="currentColor" />
      <circle cx="6" cy="3.5" r="0.85" fill="#fff" />
      <path d="M6 5.5v3.5" stroke="#fff" strokeWidth="1.5" strokeLinecap="round" />
    </svg>
  );
}

/** Severity of a check or message as shape + word; colour only reinforces it. */
export function SeverityBadge({ severity, children }: { severity: Severity; children?: ReactNode }) {
  const c = SEVERITY_COLOURS[severity];
  return (
    <span className="badge" style={{ color: c.text, background: c.tint, borderColor: c.border }}>
      <SeverityIcon severity={severity} />
      {children ?? SEVERITY_LABEL[severity]}
    </span>
  );
}
