"use client";

import { useEffect, useState } from "react";
import { signOut } from "next-auth/react";

export function SignOutButton() {
  // Enabled only once the page is interactive, so an early click is never silently lost.
  const [ready, setReady] = useState(false);
  useEffect(() => setReady(true), []);
  return (
    <button
      type="button"
      disabled={!ready}
      onClick={() => signOut({ callbackUrl: "/sign-in" })}
      className="rounded-md px-3 py-2 text-sm font-medium text-ink-200 hover:bg-ink-800 hover:text-white disabled:opacity-70"
    >
      Sign out
    </button>
  );
}
