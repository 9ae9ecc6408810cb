"use client";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { fetchJson } from "@/lib/client/fetch-json";

/** Puts one failed background task back in the queue. */
export function RetryTaskButton({ id }: { id: number }) {
  const router = useRouter();
  const [state, setState] = useState<"idle" | "busy" | "error">("idle");
  const [message, setMessage] = useState<string | null>(null);
  return (
    <div>
      <button
        type="button"
        disabled={state === "busy"}
        onClick={async () => {
          setState("busy");
          try {
            await fetchJson(`/api/admin/background/${id}/retry`, { method: "POST" });
            setState("idle");
            setMessage("Queued again.");
            router.refresh();
          } catch (err) {
            setState("error");
            setMessage(err instanceof Error ? err.message : "Could not queue it again");
          }
        }}
        className="rounded-md border border-fjord-600 px-3 py-1.5 text-sm font-medium text-fjord-700 hover:bg-fjord-50 disabled:opacity-40"
      >
        Try again
      </button>
      {message && (
        <p role="status" className="mt-1 text-xs text-ink-700">
          {state === "error" ? "⚠ " : ""}
          {message}
        </p>
      )}
    </div>
  );
}
