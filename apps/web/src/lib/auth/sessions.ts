import "server-only";
import { headers } from "next/headers";
import { checkSession, endSession, openSession } from "@coldtrail/db";
import { db } from "../db";

/**
 * Requests the browser makes on its own (the notifications bell's polling) send this header; they do
 * not count as activity, so a screen left open still reaches the idle timeout.
 */
export const BACKGROUND_HEADER = "x-coldtrail-background";

async function isBackgroundRequest(): Promise<boolean> {
  try {
    return (await headers()).get(BACKGROUND_HEADER) === "1";
  } catch {
    return false; // outside a request (no headers to read)
  }
}

/** True while the server-side session behind a session cookie still works; records the person's activity. */
export async function sessionStillOpen(sessionId: unknown, userId: number): Promise<boolean> {
  if (typeof sessionId !== "string" || sessionId === "") return false;
  const check = await checkSession(db(), { sessionId, activity: !(await isBackgroundRequest()) });
  return check.ok && check.userId === userId;
}

export async function startSession(opts: { userId: number; organisationId: number; userAgent?: string | null }): Promise<string> {
  return openSession(db(), opts);
}

export async function finishSession(sessionId: unknown): Promise<void> {
  if (typeof sessionId === "string" && sessionId) await endSession(db(), { sessionId, reason: "signed_out" });
}
