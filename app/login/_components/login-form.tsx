"use client";

import { useActionState, useState } from "react";
import { Alert } from "../../_components/alert";
import { Button } from "../../_components/button";
import { fieldErrorsOf, type FormState } from "../../_components/form-result";
import { TextField } from "../../_components/text-field";
import { loginAction } from "../actions";

export function LoginForm({ next }: { next: string }) {
  const [state, action, pending] = useActionState<FormState, FormData>(loginAction, null);
  const errors = fieldErrorsOf(state);
  // controlled, so a failed attempt keeps the name (React resets uncontrolled fields after an action)
  const [name, setName] = useState("");
  return (
    <form action={action} className="form login-form" noValidate>
      {state?.error ? (
        <Alert tone="error" title="Not logged in">
          <p>{state.error.message}</p>
        </Alert>
      ) : null}
      <input type="hidden" name="next" value={next} />
      <TextField label="User name" name="name" autoComplete="username" required value={name} onChange={(e) => setName(e.target.value)} error={errors.name} />
      <TextField label="Password" name="password" type="password" autoComplete="current-password" required error={errors.password} />
      <Button type="submit" variant="primary" disabled={pending}>
        {pending ? "Logging in…" : "Log in"}
      </Button>
    </form>
  );
}
