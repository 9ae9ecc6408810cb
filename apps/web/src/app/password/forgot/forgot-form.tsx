"use client";

import { useId, useState } from "react";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";

/** Always the same answer, whether or not the address has an account. */
export function ForgotForm() {
  const uid = useId();
  const [answer, setAnswer] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [pending, setPending] = useState(false);

  async function onSubmit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const email = String(new FormData(event.currentTarget).get("email") ?? "");
    setPending(true);
    setError(null);
    try {
      const res = await fetchJson<{ message: string }>("/api/password/forgot", { method: "POST", body: JSON.stringify({ email }) });
      setAnswer(res.message);
    } catch (err) {
      setError(
        err instanceof ApiError
          ? (err.fieldErrors.email?.[0] ?? err.message)
          : "The request could not be sent. Check your connection and try again.",
      );
    } finally {
      setPending(false);
    }
  }

  if (answer) {
    return (
      <p role="status" className="flex items-start gap-2 rounded-md border border-ok/40 bg-green-50 px-3 py-2 text-ok">
        <span aria-hidden="true">✉</span>
        <span>{answer}</span>
      </p>
    );
  }
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      <div>
        <label htmlFor={`${uid}-email`} className="block text-sm font-medium text-ink-800">
          Email
        </label>
        <input
          id={`${uid}-email`}
          name="email"
          type="email"
          autoComplete="username"
          required
          className="mt-1 block w-full rounded-md border border-ink-300 bg-white px-3 py-3 text-base text-ink-950 shadow-sm aria-[invalid=true]:border-sev-critical"
          aria-invalid={error ? true : undefined}
          aria-describedby={error ? `${uid}-email-error` : undefined}
        />
        {error && (
          <p id={`${uid}-email-error`} className="mt-1 flex items-start gap-1.5 text-sm font-medium text-sev-critical">
            <span aria-hidden="true">⚠</span>
            <span>{error}</span>
          </p>
        )}
      </div>
      <button
        type="submit"
        disabled={pending}
        className="flex w-full items-center justify-center rounded-md bg-fjord-600 px-4 py-3 text-base font-semibold text-white hover:bg-fjord-700 disabled:opacity-60"
      >
        {pending ? "Sending…" : "Send me a link"}
      </button>
    </form>
  );
}
