import "server-only";
import { cache } from "react";
import { getServerSession } from "next-auth";
import { defineAbilityFor, type Actor, type AppAbility } from "@coldtrail/core";
import { loadActor } from "@coldtrail/db";
import { authOptions } from "./options";
import { db } from "../db";

export interface SignedIn {
  actor: Actor;
  ability: AppAbility;
}

/**
 * The signed-in, active person with their permissions, or null. The session only carries the user
 * id; roles, branches and grants are read fresh so a change or a deactivation applies at once.
 */
export const currentActor = cache(async (): Promise<SignedIn | null> => {
  const session = await getServerSession(authOptions);
  const userId = session?.user?.id;
  if (typeof userId !== "number") return null;
  const actor = await loadActor(db(), userId);
  if (!actor) return null;
  return { actor, ability: defineAbilityFor(actor) };
});
