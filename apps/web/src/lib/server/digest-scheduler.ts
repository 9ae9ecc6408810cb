import { getDb } from "@coldtrail/db";
import { sendDailyDigests } from "./finding-mail";
import { env } from "../env";

/**
 * Sends the daily digest once a day, at the first check after 07:00 UTC (checked every 10 minutes
 * while the server runs). A digest already sent today is never sent twice (see `collectDigests`).
 */
const CHECK_MS = 10 * 60_000;
const SEND_FROM_HOUR_UTC = 7;

const globalForDigest = globalThis as unknown as { __coldtrailDigest?: { timer: ReturnType<typeof setInterval>; lastDay: string | null } };

export function startDigestScheduler(): void {
  if (globalForDigest.__coldtrailDigest || env.COLDTRAIL_DIGEST === "off") return;
  const state = { timer: setInterval(tick, CHECK_MS), lastDay: null as string | null };
  state.timer.unref?.();
  globalForDigest.__coldtrailDigest = state;

  function tick() {
    const now = new Date();
    const day = now.toISOString().slice(0, 10);
    if (now.getUTCHours() < SEND_FROM_HOUR_UTC || state.lastDay === day) return;
    state.lastDay = day;
    sendDailyDigests(getDb(), { now })
      .then(({ sent }) => sent > 0 && console.log(`[digest] sent ${sent} daily digest(s)`))
      .catch((err: unknown) => console.error("[digest] failed", err));
  }
}
