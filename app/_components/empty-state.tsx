import type { ReactNode } from "react";

/** What a page shows when there is nothing yet, with the way forward. */
export function EmptyState({ title, children, actions }: { title: string; children?: ReactNode; actions?: ReactNode }) {
  return (
    <div className="empty-state">
      <svg width="44" height="44" viewBox="0 0 44 44" aria-hidden="true" style={{ marginBottom: "0.5rem" }}>
        <rect x="6" y="30" width="32" height="6" rx="1.5" fill="#d3d8de" />
        <rect x="10" y="22" width="24" height="6" rx="1.5" fill="#e3e7eb" />
        <rect x="14" y="14" width="16" height="6" rx="1.5" fill="none" stroke="#9aa3ad" strokeDasharray="3 2" />
      </svg>
      <h2 className="empty-state__title">{title}</h2>
      {children ? <div>{children}</div> : null}
      {actions ? <div className="empty-state__actions">{actions}</div> : null}
    </div>
  );
}
