"use client";

import Link from "next/link";
import { useEffect, useId, useRef, useState } from "react";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { fetchJson } from "@/lib/client/fetch-json";

interface NotificationRow {
  id: number;
  kind: string;
  title: string;
  body: string | null;
  link: string | null;
  createdAt: string;
  readAt: string | null;
}
interface NotificationPage {
  rows: NotificationRow[];
  total: number;
  unread: number;
  page: number;
  pageSize: number;
}

const ago = (iso: string) => new Date(iso).toLocaleString("en-US", { dateStyle: "medium", timeStyle: "short" });

/** The in-app inbox: a count of what is unread in the header, and the latest notifications in a panel. */
export function NotificationsBell() {
  const uid = useId();
  const queryClient = useQueryClient();
  const [open, setOpen] = useState(false);
  const [pageSize, setPageSize] = useState(8);
  const panel = useRef<HTMLDivElement>(null);
  const button = useRef<HTMLButtonElement>(null);

  const inbox = useQuery({
    queryKey: ["notifications", pageSize],
    // Polling is not the person's activity: it must not keep an idle session open (lib/auth/sessions.ts).
    queryFn: () => fetchJson<NotificationPage>(`/api/notifications?pageSize=${pageSize}`, { headers: { "x-coldtrail-background": "1" } }),
    refetchInterval: 60_000,
    staleTime: 10_000,
  });
  const markRead = useMutation({
    mutationFn: (body: { ids: number[] } | { all: true }) =>
      fetchJson<{ changed: number }>("/api/notifications/read", { method: "POST", body: JSON.stringify(body) }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: ["notifications"] }),
  });

  useEffect(() => {
    if (!open) return;
    const onKey = (e: KeyboardEvent) => {
      if (e.key === "Escape") {
        setOpen(false);
        button.current?.focus();
      }
    };
    const onClick = (e: MouseEvent) => {
      if (!panel.current?.contains(e.target as Node) && !button.current?.contains(e.target as Node)) setOpen(false);
    };
    document.addEventListener("keydown", onKey);
    document.addEventListener("mousedown", onClick);
    return () => {
      document.removeEventListener("keydown", onKey);
      document.removeEventListener("mousedown", onClick);
    };
  }, [open]);

  const unread = inbox.data?.unread ?? 0;
  const rows = inbox.data?.rows ?? [];

  return (
    <div className="relative">
      <button
        ref={button}
        type="button"
        aria-expanded={open}
        aria-controls={`${uid}-panel`}
        onClick={() => setOpen((o) => !o)}
        className="relative flex min-h-10 items-center gap-1.5 rounded-md px-3 py-2 text-sm font-medium text-ink-200 hover:bg-ink-800 hover:text-white"
        data-testid="notifications-button"
      >
        <svg
          width="20"
          height="20"
          viewBox="0 0 24 24"
          fill="none"
          stroke="currentColor"
          strokeWidth="2"
          strokeLinecap="round"
          strokeLinejoin="round"
          aria-hidden="true"
        >
          <path d="M6 10a6 6 0 0 1 12 0c0 5 2 6 2 6H4s2-1 2-6" />
          <path d="M10 20a2 2 0 0 0 4 0" />
        </svg>
        <span className="sr-only sm:not-sr-only">Notices</span>
        <span className="sr-only">{unread > 0 ? `, ${unread} unread` : ", none unread"}</span>
        {unread > 0 && (
          <span
            aria-hidden="true"
            className="tabular rounded-full bg-white px-1.5 text-xs font-bold text-ink-900"
            data-testid="notifications-count"
          >
            {unread > 99 ? "99+" : unread}
          </span>
        )}
      </button>
      {open && (
        <div
          ref={panel}
          id={`${uid}-panel`}
          role="region"
          aria-label="Notifications"
          className="fixed inset-x-2 top-16 z-40 max-h-[75vh] overflow-y-auto rounded-lg border border-ink-200 bg-white p-3 text-ink-900 shadow-xl sm:absolute sm:inset-x-auto sm:right-0 sm:top-12 sm:w-96"
        >
          <div className="flex items-center justify-between gap-2">
            <h2 className="font-semibold">Notifications</h2>
            {unread > 0 && (
              <button
                type="button"
                onClick={() => markRead.mutate({ all: true })}
                className="rounded-md px-2 py-1 text-sm font-medium text-fjord-700 underline"
              >
                Mark all as read
              </button>
            )}
          </div>
          {inbox.isError && <p className="mt-2 text-sm text-sev-critical">⚠ Notifications could not be loaded.</p>}
          {rows.length === 0 && !inbox.isLoading && <p className="mt-2 text-sm text-ink-600">Nothing yet.</p>}
          <ul className="mt-2 divide-y divide-ink-100">
            {rows.map((n) => {
              const content = (
                <>
                  <span className="flex items-start gap-2">
                    {!n.readAt && (
                      <span className="mt-0.5 shrink-0 rounded bg-fjord-600 px-1.5 text-[11px] font-bold uppercase text-white">
                        <span aria-hidden="true">● </span>New
                      </span>
                    )}
                    <span className="font-medium">{n.title}</span>
                  </span>
                  {n.body && <span className="mt-0.5 block text-sm text-ink-700">{n.body}</span>}
                  <span className="mt-0.5 block text-xs text-ink-500 tabular">{ago(n.createdAt)}</span>
                </>
              );
              return (
                <li key={n.id} data-testid="notification">
                  {n.link ? (
                    <Link
                      href={n.link}
                      onClick={() => {
                        if (!n.readAt) markRead.mutate({ ids: [n.id] });
                        setOpen(false);
                      }}
                      className="block rounded px-1 py-2 hover:bg-fjord-50"
                    >
                      {content}
                    </Link>
                  ) : (
                    <div className="px-1 py-2">{content}</div>
                  )}
                </li>
              );
            })}
          </ul>
          {inbox.data && inbox.data.total > rows.length && (
            <button
              type="button"
              onClick={() => setPageSize((s) => Math.min(50, s + 10))}
              className="mt-2 w-full rounded-md border border-ink-200 px-3 py-2 text-sm font-medium"
            >
              Show more
            </button>
          )}
        </div>
      )}
    </div>
  );
}
