import type { ReactNode } from "react";

/** Ids of the parts around an input, so aria-describedby lists only those present. */
export function describedBy(id: string, parts: { hint?: unknown; error?: unknown; extra?: string }): string | undefined {
  const ids = [parts.error ? `${id}-error` : null, parts.hint ? `${id}-hint` : null, parts.extra ?? null].filter(Boolean);
  return ids.length ? ids.join(" ") : undefined;
}

/** The messages of a field; several messages are joined into one line each. */
export function FieldError({ id, messages }: { id: string; messages?: readonly string[] | string | null }) {
  const list = typeof messages === "string" ? [messages] : (messages ?? []);
  if (!list.length) return null;
  return (
    <div id={`${id}-error`}>
      {list.map((m, i) => (
        <p className="field__error" key={i}>
          {m}
        </p>
      ))}
    </div>
  );
}

export function FieldLabel({ htmlFor, children, optional }: { htmlFor: string; children: ReactNode; optional?: boolean }) {
  // "(optional)" sits beside the label, not in it, so the field's name stays "Page", not "Page (optional)";
  // required fields say so through their required attribute.
  return (
    <span className="field__label-row">
      <label className="field__label" htmlFor={htmlFor}>
        {children}
      </label>
      {optional ? <span className="field__optional">(optional)</span> : null}
    </span>
  );
}

export function FieldHint({ id, children }: { id: string; children?: ReactNode }) {
  if (!children) return null;
  return (
    <span className="field__hint" id={`${id}-hint`}>
      {children}
    </span>
  );
}

/** Turns a field name such as "laserPower.value" into an id safe for HTML and CSS. */
export function fieldId(name: string): string {
  return `field-${name.replace(/[^A-Za-z0-9_-]/g, "-")}`;
}
