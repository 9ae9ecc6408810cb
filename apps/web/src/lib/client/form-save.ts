import type { FieldPath, FieldValues, UseFormHandleSubmit, UseFormSetError } from "react-hook-form";
import { ApiError } from "./fetch-json";

/**
 * After a failed save: puts the route's field errors beside their inputs and returns the message for
 * the top of the form (the route's own, or `fallback` when the request did not get an answer).
 */
export function saveErrorMessage<T extends FieldValues>(err: unknown, setError: UseFormSetError<T>, fallback: string): string {
  if (!(err instanceof ApiError)) return fallback;
  for (const [field, messages] of Object.entries(err.fieldErrors))
    setError(field as FieldPath<T>, { type: "server", message: messages[0] });
  return err.message;
}

/**
 * A form's submit handler: clears the message at the top of the form and saves the parsed values, or,
 * when a field is invalid, says so at the top (`invalid`, e.g. "Some fields need attention before the
 * cylinder can be saved.") while each field shows its own error.
 */
export function submitOrExplain<T extends FieldValues, TOut>(
  handleSubmit: UseFormHandleSubmit<T, TOut>,
  opts: { save: (values: TOut) => void; setFormError: (message: string | null) => void; invalid: string },
) {
  return handleSubmit(
    (values) => {
      opts.setFormError(null);
      opts.save(values);
    },
    () => opts.setFormError(opts.invalid),
  );
}
