"use client";

import { useRef, useState, useTransition, type FormEvent } from "react";
import { Button } from "../../_components/button";
import { fieldErrorsOf, type FormState } from "../../_components/form-result";
import { TextAreaField } from "../../_components/text-field";
import { useFocusOnError } from "../../_components/use-focus-on-error";

/** Rejecting replaces deleting: the record stays, marked rejected, and the reason goes into the history. */
export function RejectForm({ id, version, action }: { id: number; version: number; action: (fd: FormData) => Promise<FormState> }) {
  const formRef = useRef<HTMLFormElement>(null);
  const alertRef = useRef<HTMLDivElement>(null);
  const [state, setState] = useState<FormState>(null);
  const [attempt, setAttempt] = useState(0);
  const [pending, startTransition] = useTransition();
  const errors = fieldErrorsOf(state);
  useFocusOnError(formRef, alertRef, attempt, Boolean(state && !errors.reason));

  function onSubmit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const fd = new FormData(e.currentTarget);
    startTransition(async () => {
      setState(await action(fd));
      setAttempt((n) => n + 1);
    });
  }

  return (
    <details className="reject">
      <summary className="button button--danger button--small" style={{ listStyle: "none", display: "inline-flex" }}>
        Reject this record…
      </summary>
      <form ref={formRef} onSubmit={onSubmit} noValidate style={{ marginTop: "0.75rem" }}>
        {state && !errors.reason ? (
          <div ref={alertRef} tabIndex={-1} className="alert alert--error" role="alert">
            <p className="alert__title">Not rejected</p>
            <p>{state.error.message}</p>
          </div>
        ) : null}
        <input type="hidden" name="id" value={id} />
        <input type="hidden" name="version" value={version} />
        <TextAreaField label="Reason" name="reason" rows={3} required error={errors.reason} hint="Kept in the history. The record stays in the collection, marked rejected; nothing is deleted." />
        <div className="form-actions" style={{ marginTop: "0.75rem" }}>
          <Button type="submit" variant="danger" disabled={pending}>
            {pending ? "Rejecting…" : "Reject record"}
          </Button>
        </div>
      </form>
    </details>
  );
}
