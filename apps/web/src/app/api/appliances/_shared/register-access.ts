import "server-only";
import { recordId } from "@/lib/api/params";
import { ForbiddenError, subject } from "@casl/ability";
import type { Action, Actor, AppAbility } from "@coldtrail/core";
import { DomainError, getRegisterRef, type Knex } from "@coldtrail/db";

/** The three registers: their table and their permission subject. */
export const REGISTERS = {
  appliance: { table: "appliances", subject: "Appliance", noun: "appliance" },
  equipment: { table: "recovery_equipment", subject: "RecoveryEquipment", noun: "recovery equipment" },
  cylinder: { table: "cylinders", subject: "Cylinder", noun: "cylinder" },
} as const;
export type RegisterKind = keyof typeof REGISTERS;

/** A route's `[id]` as a record id; anything else is simply not found. */
export function parseId(raw: string | undefined, noun: string): number {
  return recordId(raw, `No such ${noun}`);
}

/**
 * Loads where a register record belongs and checks the action on it. A record the person may not
 * even read is "not found" (its existence is not revealed); one they may read but not change is 403.
 */
export async function authorizeRegisterRecord(
  ctx: { actor: Actor; ability: AppAbility; db: Knex },
  kind: RegisterKind,
  rawId: string | undefined,
  action: Action,
): Promise<{ id: number; organisationId: number; branchId: number }> {
  const spec = REGISTERS[kind];
  const id = parseId(rawId, spec.noun);
  const ref = await getRegisterRef(ctx.db, { table: spec.table, organisationId: ctx.actor.organisationId, id });
  if (!ref) throw new DomainError("not_found", `No such ${spec.noun}`);
  const record = subject(spec.subject, { organisationId: ref.organisationId, branchId: ref.branchId });
  if (ctx.ability.cannot("read", record)) throw new DomainError("not_found", `No such ${spec.noun}`);
  if (action !== "read") ForbiddenError.from(ctx.ability).throwUnlessCan(action, record);
  return ref;
}

/** Refuses to create a register record in a branch the person may not write to. */
export function authorizeCreateInBranch(
  ability: AppAbility,
  actor: Actor,
  kind: RegisterKind | "Site" | "Customer",
  branchId: number,
): void {
  const name = kind === "Site" || kind === "Customer" ? kind : REGISTERS[kind].subject;
  ForbiddenError.from(ability).throwUnlessCan("create", subject(name, { organisationId: actor.organisationId, branchId }));
}

/** What the person may do with one record of a branch, for the screens (the server checks again on every write). */
export function registerPermissions(ability: AppAbility, kind: RegisterKind, ref: { organisationId: number; branchId: number }) {
  const record = subject(REGISTERS[kind].subject, { organisationId: ref.organisationId, branchId: ref.branchId });
  return {
    update: ability.can("update", record),
    readActivity: ability.can("read", subject("Activity", { organisationId: ref.organisationId, branchId: ref.branchId })),
  };
}
