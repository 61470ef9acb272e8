"use client";

import { useActionState } from "react";
import { Alert } from "../../../_components/alert";
import { Button } from "../../../_components/button";
import { fieldErrorsOf, type FormState } from "../../../_components/form-result";
import { Select } from "../../../_components/select";
import { TextField } from "../../../_components/text-field";
import { addUserAction, changeUserAction } from "../actions";

const ROLE_OPTIONS = [
  { value: "contributor", label: "Contributor" },
  { value: "reviewer", label: "Reviewer" },
  { value: "admin", label: "Admin" },
];

export function AddUserForm() {
  const [state, action, pending] = useActionState<FormState, FormData>(addUserAction, null);
  const errors = fieldErrorsOf(state);
  return (
    <form action={action} className="form" noValidate>
      {state?.error ? (
        <Alert tone="error" title="Not added">
          <p>{state.error.message}</p>
        </Alert>
      ) : null}
      <div className="form-grid">
        <TextField className="span-4" label="Name" name="name" autoComplete="off" required error={errors.name} />
        <Select className="span-3" label="Role" name="role" options={ROLE_OPTIONS} defaultValue="contributor" error={errors.role} />
        <TextField className="span-5" label="Password" name="password" type="password" autoComplete="new-password" optional hint="At least 10 characters. Without one the account cannot log in until a password is set." error={errors.password} />
      </div>
      <div className="form-actions">
        <Button type="submit" variant="primary" disabled={pending}>
          Add the account
        </Button>
      </div>
    </form>
  );
}

export function UserRowForm({ user, self }: { user: { id: number; name: string; role: string; disabled: boolean }; self: boolean }) {
  const [state, action, pending] = useActionState<FormState, FormData>(changeUserAction, null);
  const errors = fieldErrorsOf(state);
  return (
    <form action={action} className="user-row-form" aria-label={`Change ${user.name}`}>
      <input type="hidden" name="id" value={user.id} />
      <Select label="Role" name="role" id={`role-${user.id}`} options={ROLE_OPTIONS} defaultValue={user.role} error={errors.role} />
      <Select
        label="Account"
        name="disabled"
        id={`disabled-${user.id}`}
        options={[
          { value: "false", label: "Enabled" },
          { value: "true", label: self ? "Disabled (your own account)" : "Disabled" },
        ]}
        defaultValue={String(user.disabled)}
      />
      <TextField label="New password" name="password" id={`password-${user.id}`} type="password" autoComplete="new-password" optional error={errors.password} />
      <Button type="submit" size="small" disabled={pending}>
        Save
      </Button>
      {state?.error ? <p className="field__error" role="alert">{state.error.message}</p> : null}
    </form>
  );
}
