"use client";

import { useId, useState } from "react";
import { signIn, signOut } from "next-auth/react";
import { PASSWORD_MIN_LENGTH, passwordProblem } from "@coldtrail/core";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import { FieldError } from "@/components/form";

const inputClass =
  "mt-1 block w-full rounded-md border border-ink-300 bg-white px-3 py-2.5 text-base text-ink-950 shadow-sm aria-[invalid=true]:border-sev-critical";

type Errors = Partial<Record<"currentPassword" | "password" | "confirmPassword", string>>;

/** Current password, new password twice; the same rules as the server (core passwordProblem). */
export function ChangePasswordForm() {
  const uid = useId();
  const [errors, setErrors] = useState<Errors>({});
  const [formError, setFormError] = useState<string | null>(null);
  const [pending, setPending] = useState(false);

  async function onSubmit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const data = new FormData(event.currentTarget);
    const currentPassword = String(data.get("currentPassword") ?? "");
    const password = String(data.get("password") ?? "");
    const confirmPassword = String(data.get("confirmPassword") ?? "");
    const local: Errors = {};
    if (!currentPassword) local.currentPassword = "Enter your current password";
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
      const { email } = await fetchJson<{ email: string }>("/api/account/password", {
        method: "POST",
        body: JSON.stringify({ currentPassword, password, confirmPassword }),
      });
      // Every session ended with the change, this one too: sign in again with the new password.
      const result = await signIn("credentials", { email, password, redirect: false });
      window.location.assign(result && !result.error ? "/account?changed=1" : "/sign-in");
    } catch (err) {
      setPending(false);
      if (err instanceof ApiError) {
        setErrors(Object.fromEntries(Object.entries(err.fieldErrors).map(([k, v]) => [k, v[0]])));
        setFormError(err.message);
      } else {
        setFormError("The password could not be changed. Check your connection and try again.");
      }
    }
  }

  const field = (name: keyof Errors, label: string, autoComplete: string, hint?: string) => (
    <div>
      <label htmlFor={`${uid}-${name}`} className="block text-sm font-medium text-ink-800">
        {label}
      </label>
      <input
        id={`${uid}-${name}`}
        name={name}
        type="password"
        autoComplete={autoComplete}
        className={inputClass}
        aria-invalid={errors[name] ? true : undefined}
        aria-describedby={
          [hint ? `${uid}-${name}-hint` : null, errors[name] ? `${uid}-${name}-error` : null].filter(Boolean).join(" ") || undefined
        }
      />
      {hint && (
        <p id={`${uid}-${name}-hint`} className="mt-1 text-sm text-ink-600">
          {hint}
        </p>
      )}
      <FieldError id={`${uid}-${name}-error`} message={errors[name]} />
    </div>
  );

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {formError && (
        <p
          role="alert"
          className="flex items-start gap-2 rounded-md border border-sev-critical/40 bg-red-50 px-3 py-2 text-sm text-sev-critical"
        >
          <span aria-hidden="true">⚠</span>
          <span>{formError}</span>
        </p>
      )}
      {field("currentPassword", "Current password", "current-password")}
      {field(
        "password",
        "New password",
        "new-password",
        `At least ${PASSWORD_MIN_LENGTH} characters, and not one of the common passwords. A few unrelated words make a good one.`,
      )}
      {field("confirmPassword", "The same new password again", "new-password")}
      <button
        type="submit"
        disabled={pending}
        className="rounded-md bg-fjord-600 px-4 py-2.5 text-sm font-semibold text-white hover:bg-fjord-700 disabled:opacity-60"
      >
        {pending ? "Saving…" : "Change password"}
      </button>
    </form>
  );
}

/** Ends every session of the person, then this browser's cookie. */
export function SignOutEverywhere() {
  const [pending, setPending] = useState(false);
  const [error, setError] = useState<string | null>(null);
  async function onClick() {
    setPending(true);
    setError(null);
    try {
      await fetchJson("/api/account/sign-out-everywhere", { method: "POST" });
      await signOut({ callbackUrl: "/sign-in" });
    } catch {
      setPending(false);
      setError("Could not sign out everywhere. Check your connection and try again.");
    }
  }
  return (
    <div>
      <button
        type="button"
        onClick={onClick}
        disabled={pending}
        className="rounded-md border border-sev-critical/60 bg-white px-4 py-2.5 text-sm font-semibold text-sev-critical hover:bg-red-50 disabled:opacity-60"
      >
        {pending ? "Signing out…" : "Sign out everywhere"}
      </button>
      {error && (
        <p role="alert" className="mt-2 text-sm text-sev-critical">
          <span aria-hidden="true">⚠ </span>
          {error}
        </p>
      )}
    </div>
  );
}
