import {
  AbilityBuilder,
  createMongoAbility,
  subject as subjectTag,
  type ForcedSubject,
  type MongoAbility,
  type MongoQuery,
} from "@casl/ability";
import type { Role } from "../vocabulary";

/** What a person can do something to. Conditions use the camelCase field names of these subjects. */
export const SUBJECTS = [
  "Organisation",
  "Branch",
  "User",
  "Membership",
  "InspectorGrant",
  "Settings",
  "Customer",
  "Site",
  "Appliance",
  "RecoveryEquipment",
  "Cylinder",
  "Job",
  "Certification",
  "Disposal",
  "ReclaimShipment",
  "Purchase",
  "Audit",
  "Finding",
  "Activity",
  // Spreadsheet imports (cards and imports):
  "Import",
  // One's own account: password, sessions (every signed-in person, on themselves only).
  "Account",
] as const;
export type SubjectName = (typeof SUBJECTS)[number];

export const ACTIONS = [
  "manage",
  "read",
  "create",
  "update",
  "void",
  "verify",
  "run",
  "export",
  "assign",
  "propose_fix",
  "accept",
  "reopen",
  "waive",
  "comment",
  "invite",
] as const;
export type Action = (typeof ACTIONS)[number];

/** A subject name, or a record tagged with its subject name (`subject("Job", row)`). */
export type AppSubject = SubjectName | "all" | Record<string, unknown> | ForcedSubject<SubjectName>;
export type AppAbility = MongoAbility<[Action, AppSubject], MongoQuery>;

export interface ActorMembership {
  branchId: number | null;
  role: Role;
}

export interface ActorInspectorGrant {
  id: number;
  branchIds: number[];
  recordsFrom: string;
  recordsTo: string;
  expiresAt: string;
  revokedAt: string | null;
}

/** The signed-in person, as the permission rules see them. */
export interface Actor {
  userId: number;
  organisationId: number;
  name: string;
  email: string;
  memberships: ActorMembership[];
  inspectorGrants: ActorInspectorGrant[];
}

/** Records a branch owns: read and kept by the branch's manager. */
const BRANCH_RECORDS: SubjectName[] = [
  "Customer",
  "Site",
  "Appliance",
  "RecoveryEquipment",
  "Cylinder",
  "Job",
  "Disposal",
  "ReclaimShipment",
  "Purchase",
];

/** Branch records that happen on a date; an inspector reads them only inside the granted window. */
const DATED_RECORDS: SubjectName[] = ["Job", "Disposal", "ReclaimShipment", "Purchase"];

/** Registers a technician needs to read to log work in their branch. */
const FIELD_REGISTERS: SubjectName[] = ["Customer", "Site", "Appliance", "RecoveryEquipment", "Cylinder"];

export function rolesOf(actor: Actor): Role[] {
  return [...new Set(actor.memberships.map((m) => m.role))];
}

export function branchIdsFor(actor: Actor, role: Role): number[] {
  return actor.memberships.filter((m) => m.role === role && m.branchId !== null).map((m) => m.branchId as number);
}

/** The calendar day after `date` (YYYY-MM-DD), for comparing instants with the last day of a window. */
export function dayAfter(date: string): string {
  const d = new Date(`${date}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() + 1);
  return d.toISOString().slice(0, 10);
}

/**
 * The date each dated record type is judged by for an inspector's window. `recordedOn` is the date
 * column of the record's own table (disposal records: disposed on; signed statements: recovered on),
 * which the query names when it applies the scope. Findings about an event use the event's date;
 * findings about a standing obligation (no event date) use the day they were opened.
 */
export const RECORD_DATE_FIELDS = ["performedOn", "purchasedOn", "shippedOn", "recordedOn", "occurredOn", "openedAt"] as const;

/** Grants that are neither revoked nor expired at `now`. */
export function activeGrants(actor: Actor, now: Date): ActorInspectorGrant[] {
  return actor.inspectorGrants.filter((g) => !g.revokedAt && new Date(g.expiresAt).getTime() > now.getTime());
}

/**
 * Every role's rules, in one place. Conditions always pin the organisation; branch roles pin
 * their branches; technicians pin themselves; inspectors pin their granted branches and dates.
 */
export function defineAbilityFor(actor: Actor, now: Date = new Date()): AppAbility {
  const { can, build } = new AbilityBuilder<AppAbility>(createMongoAbility);
  const org = { organisationId: actor.organisationId };
  const roles = rolesOf(actor);

  // Everyone signed in: their own password and sessions, nobody else's.
  can(["read", "update"], "Account", { ...org, userId: actor.userId });

  if (roles.includes("owner")) {
    can("manage", "all", org);
  }

  if (roles.includes("compliance_officer")) {
    for (const subject of SUBJECTS) can("read", subject, org);
    can(["create", "run", "export"], "Audit", org);
    can(["assign", "accept", "reopen", "waive", "comment", "update"], "Finding", org);
    can("verify", "Certification", org);
    // Cards: the officer corrects a card's details (amendment) or withdraws a card entered in error.
    can(["update", "void"], "Certification", org);
    can(["create", "update", "invite"], "InspectorGrant", org);
  }

  const managed = branchIdsFor(actor, "branch_manager");
  if (managed.length > 0) {
    const inBranches = { ...org, branchId: { $in: managed } };
    can("read", "Branch", { ...org, id: { $in: managed } });
    for (const subject of BRANCH_RECORDS) can(["read", "create", "update", "void"], subject, inBranches);
    can(["read", "propose_fix", "comment"], "Finding", inBranches);
    can(["read", "export"], "Audit", org);
    can("read", "Certification", inBranches);
    can("read", "User", inBranches);
    can("read", "Activity", inBranches);
    // Spreadsheet imports into their own branch(es); each row also needs `create` on its record.
    can(["read", "create"], "Import", inBranches);
  }

  const worked = branchIdsFor(actor, "technician");
  if (worked.length > 0) {
    const inBranches = { ...org, branchId: { $in: worked } };
    can("read", "Branch", { ...org, id: { $in: worked } });
    for (const subject of FIELD_REGISTERS) can("read", subject, inBranches);
    can(["read", "create"], "Job", { ...inBranches, technicianId: actor.userId });
    // Jobs: a technician corrects (amendment) or voids their own jobs; disposals: records and statements of their branch.
    can(["update", "void"], "Job", { ...inBranches, technicianId: actor.userId });
    can(["read", "create"], "Disposal", inBranches);
    can(["read", "create"], "Certification", { ...org, userId: actor.userId });
    // Cards: a technician corrects or withdraws their own card while it awaits verification.
    can(["update", "void"], "Certification", { ...org, userId: actor.userId, state: "pending" });
    can(["read", "comment"], "Finding", { ...org, technicianId: actor.userId });
  }

  if (roles.includes("inspector")) {
    for (const grant of activeGrants(actor, now)) {
      const inGrant = { ...org, branchId: { $in: grant.branchIds } };
      const window = { $gte: grant.recordsFrom, $lte: grant.recordsTo };
      can("read", "Branch", { ...org, id: { $in: grant.branchIds } });
      // Registers (customers, sites, appliances, equipment, cylinders) are not dated: the whole register.
      for (const subject of BRANCH_RECORDS) {
        if (DATED_RECORDS.includes(subject)) continue;
        can("read", subject, inGrant);
      }
      // Dated records only inside the granted window.
      can("read", "Job", { ...inGrant, performedOn: window });
      can("read", "Purchase", { ...inGrant, purchasedOn: window });
      can("read", "ReclaimShipment", { ...inGrant, shippedOn: window });
      can("read", "Disposal", { ...inGrant, recordedOn: window });
      can("read", "Finding", { ...inGrant, occurredOn: window });
      can("read", "Finding", { ...inGrant, occurredOn: null, openedAt: { $gte: grant.recordsFrom, $lt: dayAfter(grant.recordsTo) } });
      can(["read", "export"], "Audit", org);
      can("read", "Certification", inGrant);
    }
  }

  // Nothing is granted by default: an actor without memberships can do nothing.
  return build();
}

/**
 * Whether the person may `action` some records of `subjectName` in a branch, whatever their dates: for
 * screens that decide whether to show a branch's section at all (its lists then apply the full rules,
 * dates included). Rules are taken as they are, with the date conditions of an inspector's window left out.
 */
export function canInBranchAnyDate(
  ability: AppAbility,
  action: Action,
  subjectName: SubjectName,
  where: { organisationId: number; branchId: number },
): boolean {
  const dateFields = new Set<string>(RECORD_DATE_FIELDS);
  const rules = ability
    .rulesFor(action, subjectName)
    .filter((r) => !r.inverted)
    .map((r) => ({
      action,
      subject: subjectName,
      conditions: r.conditions
        ? Object.fromEntries(Object.entries(r.conditions as Record<string, unknown>).filter(([k]) => !dateFields.has(k)))
        : undefined,
    }));
  return createMongoAbility<AppAbility>(rules as never).can(action, subjectTag(subjectName, { ...where }));
}
