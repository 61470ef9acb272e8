/**
 * What a server action hands back to a form: nothing on success (it redirects), or the error
 * with field messages. The same shape as the server's error, kept here so client components do
 * not import the server layer.
 */
export interface FormError {
  code: string;
  message: string;
  details?: {
    fieldErrors?: Record<string, string[]>;
    existingSourceId?: number;
    currentVersion?: number;
    [key: string]: unknown;
  };
}

export type FormState = { error: FormError } | null;

/** Field messages of a form error (an empty object when there are none). */
export function fieldErrorsOf(state: FormState): Record<string, string[]> {
  return state?.error.details?.fieldErrors ?? {};
}
