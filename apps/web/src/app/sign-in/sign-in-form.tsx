"use client";

import { useState } from "react";
import { signIn } from "next-auth/react";

export function SignInForm({ next }: { next: string }) {
  const [error, setError] = useState<string | null>(null);
  const [pending, setPending] = useState(false);

  async function onSubmit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    setError(null);
    setPending(true);
    const form = new FormData(event.currentTarget);
    const result = await signIn("credentials", {
      email: String(form.get("email") ?? ""),
      password: String(form.get("password") ?? ""),
      redirect: false,
    });
    setPending(false);
    if (!result || result.error) {
      // A throttled sign-in says how long to wait; every other refusal gets the same words.
      setError(
        result?.error?.startsWith("Too many failed sign-ins.") ? result.error : "That email and password do not match an active account.",
      );
      return;
    }
    window.location.assign(next);
  }

  return (
    <form onSubmit={onSubmit} className="mt-8 space-y-5" noValidate>
      <div>
        <label htmlFor="email" className="block text-sm font-medium text-ink-800">
          Email
        </label>
        <input
          id="email"
          name="email"
          type="email"
          autoComplete="username"
          required
          className="mt-1 block w-full rounded-md border border-ink-300 bg-white px-3 py-3 text-base text-ink-950 shadow-sm focus:border-fjord-600"
        />
      </div>
      <div>
        <label htmlFor="password" className="block text-sm font-medium text-ink-800">
          Password
        </label>
        <input
          id="password"
          name="password"
          type="password"
          autoComplete="current-password"
          required
          className="mt-1 block w-full rounded-md border border-ink-300 bg-white px-3 py-3 text-base text-ink-950 shadow-sm focus:border-fjord-600"
        />
      </div>
      {error && (
        <p
          role="alert"
          className="flex items-start gap-2 rounded-md border border-sev-critical/40 bg-red-50 px-3 py-2 text-sm text-sev-critical"
        >
          <span aria-hidden="true">⚠</span>
          <span>{error}</span>
        </p>
      )}
      <button
        type="submit"
        disabled={pending}
        className="flex w-full items-center justify-center rounded-md bg-fjord-600 px-4 py-3 text-base font-semibold text-white hover:bg-fjord-700 disabled:opacity-60"
      >
        {pending ? "Signing in…" : "Sign in"}
      </button>
    </form>
  );
}
