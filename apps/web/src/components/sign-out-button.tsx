"use client";

import { signOut } from "next-auth/react";

export function SignOutButton() {
  return (
    <button
      type="button"
      onClick={() => signOut({ callbackUrl: "/sign-in" })}
      className="rounded-md px-3 py-2 text-sm font-medium text-ink-200 hover:bg-ink-800 hover:text-white"
    >
      Sign out
    </button>
  );
}
