import type { ReactNode } from "react";

/** A message block at the top of a form or page. Errors are announced (role=alert). */
export function Alert({ tone, title, children, id }: { tone: "error" | "warning" | "info"; title?: string; children?: ReactNode; id?: string }) {
  return (
    <div className={`alert alert--${tone}`} role={tone === "error" ? "alert" : "status"} id={id} tabIndex={-1}>
      {title ? <p className="alert__title">{title}</p> : null}
      {children}
    </div>
  );
}
