"use client";

import { useId, useState } from "react";
import { signIn } from "next-auth/react";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import { PASSWORD_MIN_LENGTH, passwordProblem } from "@coldtrail/core";
import { FieldError } from "@/components/form";

const inputClass =
  "mt-1 block w-full rounded-md border border-ink-300 bg-white px-3 py-3 text-base text-ink-950 shadow-sm aria-[invalid=true]:border-sev-critical";

/**
 * Choose a password from an e-mail link (invitation or reset), then sign in with it. `askName`
 * shows the name field (invitations). Validation is repeated on the server with the same schema.
 */
export function NewPasswordForm({
  token,
  endpoint,
  askName,
  initialName = "",
  submitLabel,
}: {
  token: string;
  endpoint: string;
  askName?: boolean;
  initialName?: string;
  submitLabel: string;
}) {
  const uid = useId();
  const [errors, setErrors] = useState<Record<string, string | undefined>>({});
  const [formError, setFormError] = useState<string | null>(null);
  const [pending, setPending] = useState(false);
  const [signedInFailed, setSignedInFailed] = useState(false);

  async function onSubmit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const data = new FormData(event.currentTarget);
    const name = String(data.get("name") ?? "");
    const password = String(data.get("password") ?? "");
    const confirmPassword = String(data.get("confirmPassword") ?? "");
    const local: Record<string, string | undefined> = {};
    if (askName && name.trim().length < 2) local.name = "Enter your full name";
    local.password = passwordProblem(password) ?? undefined;
    if (password !== confirmPassword) local.confirmPassword = "The two passwords are not the same";
    setErrors(local);
    if (Object.values(local).some(Boolean)) {
      setFormError("Some fields need attention.");
      return;
    }
    setFormError(null);
    setPending(true);
    try {
      const { email } = await fetchJson<{ email: string }>(endpoint, {
        method: "POST",
        body: JSON.stringify({ token, password, confirmPassword, ...(askName && { name }) }),
      });
      const result = await signIn("credentials", { email, password, redirect: false });
      if (!result || result.error) {
        setSignedInFailed(true);
        setPending(false);
        return;
      }
      // eslint-disable-next-line @next/next/no-location-assign-relative-destination -- a full load so the server renders with the new session
      window.location.assign("/");
    } catch (err) {
      setPending(false);
      if (err instanceof ApiError) {
        setErrors(Object.fromEntries(Object.entries(err.fieldErrors).map(([k, v]) => [k, v[0]])));
        setFormError(err.fieldErrors.token?.[0] ?? err.message);
      } else {
        setFormError("The password could not be saved. Check your connection and try again.");
      }
    }
  }

  if (signedInFailed) {
    return (
      <p role="status" className="rounded-md border border-ok/40 bg-green-50 px-3 py-2 text-ok">
        <span aria-hidden="true">✓ </span>Your password is saved.{" "}
        <a href="/sign-in" className="font-medium underline">
          Sign in
        </a>{" "}
        with it.
      </p>
    );
  }

  const described = (name: string, hint?: boolean) =>
    [hint ? `${uid}-${name}-hint` : null, errors[name] ? `${uid}-${name}-error` : null].filter(Boolean).join(" ") || undefined;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-5">
      {formError && (
        <p
          role="alert"
          className="flex items-start gap-2 rounded-md border border-sev-critical/40 bg-red-50 px-3 py-2 text-sm text-sev-critical"
        >
          <span aria-hidden="true">⚠</span>
          <span>{formError}</span>
        </p>
      )}
      {askName && (
        <div>
          <label htmlFor={`${uid}-name`} className="block text-sm font-medium text-ink-800">
            Your full name
          </label>
          <input
            id={`${uid}-name`}
            name="name"
            defaultValue={initialName}
            autoComplete="name"
            className={inputClass}
            aria-invalid={errors.name ? true : undefined}
            aria-describedby={described("name")}
          />
          <FieldError id={`${uid}-name-error`} message={errors.name} />
        </div>
      )}
      <div>
        <label htmlFor={`${uid}-password`} className="block text-sm font-medium text-ink-800">
          New password
        </label>
        <input
          id={`${uid}-password`}
          name="password"
          type="password"
          autoComplete="new-password"
          className={inputClass}
          aria-invalid={errors.password ? true : undefined}
          aria-describedby={described("password", true)}
        />
        <p id={`${uid}-password-hint`} className="mt-1 text-sm text-ink-600">
          At least {PASSWORD_MIN_LENGTH} characters, and not one of the common passwords. A few unrelated words make a good one.
        </p>
        <FieldError id={`${uid}-password-error`} message={errors.password} />
      </div>
      <div>
        <label htmlFor={`${uid}-confirm`} className="block text-sm font-medium text-ink-800">
          The same password again
        </label>
        <input
          id={`${uid}-confirm`}
          name="confirmPassword"
          type="password"
          autoComplete="new-password"
          className={inputClass}
          aria-invalid={errors.confirmPassword ? true : undefined}
          aria-describedby={described("confirmPassword")}
        />
        <FieldError id={`${uid}-confirmPassword-error`} message={errors.confirmPassword} />
      </div>
      <button
        type="submit"
        disabled={pending}
        className="flex w-full items-center justify-center rounded-md bg-fjord-600 px-4 py-3 text-base font-semibold text-white hover:bg-fjord-700 disabled:opacity-60"
      >
        {pending ? "Saving…" : submitLabel}
      </button>
    </form>
  );
}
