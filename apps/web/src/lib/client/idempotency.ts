"use client";
import { useCallback, useState } from "react";

/** A fresh key for one creation (a UUID; a random fallback where `randomUUID` is missing, e.g. plain http on a LAN). */
export function newIdempotencyKey(): string {
  if (typeof crypto !== "undefined" && typeof crypto.randomUUID === "function") return crypto.randomUUID();
  const bytes = new Uint8Array(16);
  crypto.getRandomValues(bytes);
  return Array.from(bytes, (b) => b.toString(16).padStart(2, "0")).join("");
}

/**
 * The `Idempotency-Key` of a form: made when the form opens and sent with every submit and retry, so a
 * retry after a lost answer never creates the record twice. Call `renew()` after a success when the
 * form stays open for the next record.
 */
export function useIdempotencyKey(): { key: string; headers: { "Idempotency-Key": string }; renew: () => void } {
  const [key, setKey] = useState(newIdempotencyKey);
  const renew = useCallback(() => setKey(newIdempotencyKey()), []);
  return { key, headers: { "Idempotency-Key": key }, renew };
}
