import type { InputHTMLAttributes, ReactNode, TextareaHTMLAttributes } from "react";
import { FieldError, FieldHint, FieldLabel, describedBy, fieldId } from "./field-parts";

interface FieldChrome {
  label: ReactNode;
  name: string;
  id?: string;
  hint?: ReactNode;
  error?: readonly string[] | string | null;
  optional?: boolean;
  className?: string;
}

/** The label, hint and messages around one control, bound to it through its id. */
function FieldShell({ label, inputId, hint, error, optional, className, children }: Omit<FieldChrome, "name" | "id"> & { inputId: string; children: ReactNode }) {
  return (
    <div className={["field", className].filter(Boolean).join(" ")}>
      <FieldLabel htmlFor={inputId} optional={optional}>
        {label}
      </FieldLabel>
      {children}
      <FieldHint id={inputId}>{hint}</FieldHint>
      <FieldError id={inputId} messages={error} />
    </div>
  );
}

export type TextFieldProps = FieldChrome & Omit<InputHTMLAttributes<HTMLInputElement>, "name" | "id" | "className">;

/** A labelled text input with its hint and messages bound through aria-describedby. */
export function TextField({ label, name, id, hint, error, optional, className, ...input }: TextFieldProps) {
  const inputId = id ?? fieldId(name);
  const invalid = Boolean(error && error.length);
  return (
    <FieldShell label={label} inputId={inputId} hint={hint} error={error} optional={optional} className={className}>
      <input className="input" id={inputId} name={name} aria-invalid={invalid || undefined} aria-describedby={describedBy(inputId, { hint, error: invalid })} {...input} />
    </FieldShell>
  );
}

export type TextAreaFieldProps = FieldChrome & Omit<TextareaHTMLAttributes<HTMLTextAreaElement>, "name" | "id" | "className">;

export function TextAreaField({ label, name, id, hint, error, optional, className, ...input }: TextAreaFieldProps) {
  const inputId = id ?? fieldId(name);
  const invalid = Boolean(error && error.length);
  return (
    <FieldShell label={label} inputId={inputId} hint={hint} error={error} optional={optional} className={className}>
      <textarea className="textarea" id={inputId} name={name} aria-invalid={invalid || undefined} aria-describedby={describedBy(inputId, { hint, error: invalid })} {...input} />
    </FieldShell>
  );
}
