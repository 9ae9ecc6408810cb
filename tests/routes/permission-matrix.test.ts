import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { subject } from "@casl/ability";
import type { Action, AppAbility, SubjectName } from "@coldtrail/core";
import { canOnCertification, claimAudit, createAudit, getCertificationRef, runAuditBranches } from "@coldtrail/db";
import { cardPng } from "../fixtures/card-files";
import { createHarness, METHODS, NOW, ROLES, routeFiles, type CallOptions, type Harness, type Method, type RoleKey } from "./harness";

/**
 * The permission matrix of every API route, built from the route files themselves: every `route.ts`
 * under app/api and every method it exports must have an entry here, or the first test fails.
 *
 * Each entry says which record a request targets at each place and which permission guards it. Places:
 *   own      – the Columbus branch (the branch manager's and the technician's own branch);
 *   other    – the Denver branch of the same organisation (the inspector's granted branch), a record
 *              dated outside the inspector's window (2025-01-01 … 2025-12-31) where records are dated;
 *   window   – the Denver branch, a record dated inside the inspector's window (dated records only);
 *   otherOrg – the Boise branch of another organisation.
 * Each role (owner, compliance officer, branch manager, technician, inspector, another organisation's
 * manager) calls each method at each place, and signed-out calls are made too. The expected answer is
 * read from the role's permission rules (core `defineAbilityFor`) for that record: allowed → the route
 * does not refuse (no 401/403/404, no 5xx); not allowed → 403 or 404 (or a 400 saying a record named in
 * the body is not in the caller's organisation) and no row of any table changes.
 * The rules themselves are checked against the product's role table in tests/authz; this matrix proves
 * that every route applies them to the record it touches.
 */

type Place = "own" | "other" | "window" | "otherOrg";
const PLACES_UNDATED: Place[] = ["own", "other", "otherOrg"];
const PLACES_DATED: Place[] = ["own", "other", "window", "otherOrg"];

interface Check {
  /** The request at a place (params, query, body). */
  request: (place: Place) => CallOptions | Promise<CallOptions>;
  /** Whether the role may do it at that place. */
  allowed: (ability: AppAbility, place: Place, role: RoleKey) => boolean | Promise<boolean>;
  places?: Place[];
  /** A public route (no session needed): only checked not to fail. */
  public?: boolean;
}
type Entry = Partial<Record<Method, Check>>;

let h: Harness;
const branch = { own: 0, other: 0, window: 0, otherOrg: 0 } as Record<Place, number>;
const orgOf = (place: Place) => (place === "otherOrg" ? 2 : 1);
/** Ids of a record of each kind at each place, and the fields the permission rules read. */
const rec: Record<string, Record<Place, { id: number; fields: Record<string, unknown> }>> = {};

/** The permission on the record of `kind` at the place. */
const onRecord =
  (kind: string, action: Action, name: SubjectName) =>
  (ability: AppAbility, place: Place): boolean =>
    ability.can(action, subject(name, { ...rec[kind]![place].fields }));
/** Permission to create in the branch of the place. */
const inBranch =
  (action: Action, name: SubjectName, extra: (place: Place) => Record<string, unknown> = () => ({})) =>
  (ability: AppAbility, place: Place): boolean =>
    ability.can(action, subject(name, { organisationId: orgOf(place), branchId: branch[place], ...extra(place) }));
/** A list or an organisation-wide page: the role needs the permission on some record of the kind. */
const typeLevel =
  (action: Action, name: SubjectName) =>
  (ability: AppAbility): boolean =>
    ability.can(action, name);
const idOf = (kind: string) => (place: Place) => ({ params: { id: String(rec[kind]![place].id) } });
const same =
  (opts: CallOptions = {}) =>
  () =>
    opts;
const reason = { reason: "Permission matrix check of this route" };

async function pick(table: string, place: Place, where: (q: ReturnType<Harness["t"]["db"]>) => void = () => undefined) {
  const q = h.t.db(table).where(`${table}.branch_id`, branch[place]).orderBy(`${table}.id`);
  where(q);
  const row = await q.first();
  if (!row) throw new Error(`no ${table} at ${place}`);
  return row;
}

/** Dated records: `other` outside the inspector's window, `window` inside it. */
async function pickDated(
  table: string,
  dateColumn: string,
  field: string,
  kind: string,
  extra: (r: Record<string, unknown>) => Record<string, unknown> = () => ({}),
  where: (q: ReturnType<Harness["t"]["db"]>) => void = () => undefined,
) {
  rec[kind] = {} as Record<Place, { id: number; fields: Record<string, unknown> }>;
  for (const place of PLACES_DATED) {
    const row = await pick(table, place, (q) => {
      q.whereNull(`${table}.voided_at`);
      where(q);
      if (place === "window") q.whereBetween(dateColumn, ["2025-01-01", "2025-12-31"]);
      else if (place === "other") q.where(dateColumn, ">", "2025-12-31");
    });
    rec[kind][place] = {
      id: Number(row.id),
      fields: { organisationId: Number(row.organisation_id), branchId: Number(row.branch_id), [field]: row[dateColumn], ...extra(row) },
    };
  }
}

async function pickUndated(table: string, kind: string, where: (q: ReturnType<Harness["t"]["db"]>) => void = () => undefined) {
  rec[kind] = {} as Record<Place, { id: number; fields: Record<string, unknown> }>;
  for (const place of PLACES_DATED) {
    const row = await pick(table, place === "window" ? "other" : place, where);
    rec[kind][place] = { id: Number(row.id), fields: { organisationId: Number(row.organisation_id), branchId: Number(row.branch_id) } };
  }
}

const ENTRIES: Record<string, Entry> = {};
const tally = { allowed: 0, refused: 0 };
let serialNo = 0;
const unique = (prefix: string) => `${prefix}-${++serialNo}`;
const recId = (kind: string, place: Place) => rec[kind]![place].id;

/** Valid bodies, so a refusal comes from the permission check and not from validation. */
async function appliancePatchBody(id: number) {
  const a = await h.t.db("appliances").where({ id }).first();
  return {
    siteChoice: "existing",
    siteId: a.site_id,
    customerChoice: "none",
    tag: a.tag,
    description: a.description,
    category: a.category,
    refrigerant: a.refrigerant,
    fullChargeAmount: a.full_charge_g,
    fullChargeUnit: "g",
    fullChargeMethod: a.full_charge_method,
    factorySealed: Boolean(a.factory_sealed),
    hasLeakDetection: Boolean(a.has_leak_detection),
    industrialShutdownNeeded: Boolean(a.industrial_shutdown_needed),
    makeModel: "Permission matrix",
    manufacturedOn: a.manufactured_on ?? undefined,
    installedOn: a.installed_on ?? undefined,
  };
}
async function cylinderPatchBody(id: number) {
  const c = await h.t.db("cylinders").where({ id }).first();
  return {
    serial: c.serial,
    specification: "Permission matrix",
    purpose: c.purpose,
    waterCapacityAmount: c.water_capacity_g,
    waterCapacityUnit: "g",
    tareAmount: c.tare_g,
    tareUnit: "g",
    manufacturedOn: c.manufactured_on ?? undefined,
    lastRequalifiedOn: c.last_requalified_on ?? undefined,
    status: c.status,
  };
}
async function equipmentPatchBody(id: number) {
  const e = await h.t.db("recovery_equipment").where({ id }).first();
  return {
    serial: e.serial,
    makeModel: "Permission matrix",
    manufacturedOn: e.manufactured_on ?? undefined,
    certificationState: e.certification_state,
    certifiedBy: e.certified_by ?? undefined,
    smallApplianceOnly: Boolean(e.small_appliance_only),
    systemDependent: Boolean(e.system_dependent),
    status: e.status,
  };
}
async function weighingBody(id: number) {
  const w = await h.t.db("cylinder_weighings").where({ id }).first();
  return { weighedOn: w.weighed_on, grossAmount: w.gross_g, grossUnit: "g", reason: "Permission matrix check" };
}

beforeAll(async () => {
  h = await createHarness();
  const code = async (c: string) => Number((await h.t.db("branches").where({ code: c }).first("id")).id);
  branch.own = await code("COL");
  branch.other = branch.window = await code("DEN");
  branch.otherOrg = await code("BOI");

  // Findings and audits: an audit of every branch of both organisations, plus Denver findings about
  // events inside and outside the inspector's window.
  for (const org of [1, 2]) {
    const officer = await h.t
      .db("memberships")
      .where({ organisation_id: org })
      .whereIn("role", ["compliance_officer", "owner"])
      .first("user_id");
    const branchIds = (await h.t.db("branches").where({ organisation_id: org }).select("id")).map((b) => Number(b.id));
    const id = await createAudit(h.t.db, {
      actor: { userId: Number(officer.user_id), organisationId: org },
      input: { branchIds, periodFrom: "2024-12-01", periodTo: "2026-12-01", packs: ["us_federal"] },
      now: NOW,
    });
    await claimAudit(h.t.db, { id, now: NOW });
    await runAuditBranches(h.t.db, { id, now: () => NOW });
  }
  const model = await h.t.db("findings").where({ branch_id: branch.other }).first();
  const { id: _id, ...copy } = model;
  for (const [key, on] of [
    ["inside", "2025-06-15"],
    ["outside", "2026-01-02"],
  ] as const) {
    await h.t.db("findings").insert({ ...copy, identity_key: `matrix:${key}`, occurred_on: on, state: "open", technician_id: null });
  }
  // An open finding in the other organisation's branch (its audit may find nothing open there).
  await h.t.db("findings").insert({
    ...copy,
    organisation_id: 2,
    branch_id: branch.otherOrg,
    audit_id: null,
    first_audit_id: null,
    identity_key: "matrix:boise",
    state: "open",
    technician_id: null,
    appliance_id: null,
    assignee_id: null,
  });
  rec.finding = {} as Record<Place, { id: number; fields: Record<string, unknown> }>;
  for (const place of PLACES_DATED) {
    const q = h.t.db("findings").where({ branch_id: branch[place], state: "open" }).orderBy("id");
    if (place === "window") q.where("identity_key", "matrix:inside");
    if (place === "other") q.where("identity_key", "matrix:outside");
    if (place === "otherOrg") q.where("identity_key", "matrix:boise");
    // The technician's own finding in their branch, so the technician's rule is exercised too.
    if (place === "own") q.where("technician_id", h.actors.technician.userId);
    const f = await q.first();
    if (!f) throw new Error(`no finding at ${place}`);
    rec.finding[place] = {
      id: Number(f.id),
      fields: {
        organisationId: Number(f.organisation_id),
        branchId: Number(f.branch_id),
        technicianId: f.technician_id === null ? null : Number(f.technician_id),
        occurredOn: f.occurred_on ?? null,
        openedAt: f.opened_at,
      },
    };
  }
  rec.audit = {} as Record<Place, { id: number; fields: Record<string, unknown> }>;
  for (const place of PLACES_DATED) {
    const a = await h.t
      .db("audits")
      .where({ organisation_id: orgOf(place) })
      .first();
    rec.audit[place] = { id: Number(a.id), fields: { organisationId: orgOf(place) } };
  }

  await pickDated("jobs", "performed_on", "performedOn", "job", (r) => ({ technicianId: Number(r.technician_id) }));
  // The technician's own job in their branch.
  const ownJob = await h.t
    .db("jobs")
    .where({ branch_id: branch.own, technician_id: h.actors.technician.userId })
    .whereNull("voided_at")
    .first();
  rec.job!.own = {
    id: Number(ownJob.id),
    fields: { organisationId: 1, branchId: branch.own, technicianId: Number(ownJob.technician_id), performedOn: ownJob.performed_on },
  };
  await pickDated("purchases", "purchased_on", "purchasedOn", "purchase");
  await pickDated("reclaim_shipments", "shipped_on", "shippedOn", "shipment");
  await pickDated("disposal_records", "disposed_on", "recordedOn", "disposalRecord");
  // Signed statements exist in the first organisation only; the other organisation's place uses a copy.
  const statementModel = await h.t.db("disposal_statements").first();
  const boiAppliance = await h.t.db("appliances").where({ branch_id: branch.otherOrg }).first("id");
  const { id: _sid, ...statementCopy } = statementModel;
  for (const [place, on] of [
    ["otherOrg", "2026-03-01"],
    ["other", "2026-03-01"],
    ["window", "2025-05-01"],
    ["own", "2026-03-01"],
  ] as const) {
    const applianceId =
      place === "otherOrg" ? boiAppliance.id : (await h.t.db("appliances").where({ branch_id: branch[place] }).first("id")).id;
    await h.t.db("disposal_statements").insert({
      ...statementCopy,
      organisation_id: orgOf(place),
      branch_id: branch[place],
      appliance_id: applianceId,
      recovered_on: on,
      voided_at: null,
      job_id: null,
      document_file_key: `matrix/${place}.png`,
      document_mime: "image/png",
    });
    h.storage.files.set(`matrix/${place}.png`, { bytes: cardPng(16, 16), mime: "image/png" });
  }
  await pickDated("disposal_statements", "recovered_on", "recordedOn", "statement", undefined, (q) =>
    q.where("document_file_key", "like", "matrix/%"),
  );

  await pickUndated("appliances", "appliance", (q) => q.where({ status: "in_service" }));
  await pickUndated("cylinders", "cylinder", (q) => q.where({ status: "in_service", unregistered: false }));
  await pickUndated("recovery_equipment", "equipment", (q) => q.where({ status: "in_service" }));
  rec.weighing = {} as Record<Place, { id: number; fields: Record<string, unknown> }>;
  for (const place of PLACES_DATED) {
    const w = await h.t
      .db("cylinder_weighings")
      .where({ branch_id: branch[place === "window" ? "other" : place] })
      .whereNull("voided_at")
      .orderBy("id")
      .first();
    rec.weighing[place] = {
      id: Number(w.id),
      fields: { organisationId: Number(w.organisation_id), branchId: Number(w.branch_id), cylinderId: Number(w.cylinder_id) },
    };
  }
  // People: a technician of each place's branch (never one of the signed-in demo people).
  rec.person = {} as Record<Place, { id: number; fields: Record<string, unknown> }>;
  const signedIn = new Set(Object.values(h.actors).map((a) => a.userId));
  for (const place of PLACES_DATED) {
    const m = await h.t
      .db("memberships")
      .where({ branch_id: branch[place], role: "technician" })
      .whereNotIn("user_id", [...signedIn])
      .orderBy("user_id", place === "window" ? "desc" : "asc")
      .first();
    rec.person[place] = {
      id: Number(m.user_id),
      fields: { organisationId: Number(m.organisation_id), branchId: Number(m.branch_id), id: Number(m.user_id) },
    };
  }
  // Cards: a card of a technician of each place's branch.
  rec.card = {} as Record<Place, { id: number; fields: Record<string, unknown> }>;
  for (const place of PLACES_DATED) {
    const techs = (await h.t.db("memberships").where({ branch_id: branch[place], role: "technician" }).select("user_id")).map((m) =>
      Number(m.user_id),
    );
    const card = await h.t.db("certifications").whereIn("user_id", techs).whereNull("voided_at").orderBy("id").first();
    if (!card) throw new Error(`no card at ${place}`);
    rec.card[place] = { id: Number(card.id), fields: { organisationId: Number(card.organisation_id) } };
  }
  rec.branch = {} as Record<Place, { id: number; fields: Record<string, unknown> }>;
  for (const place of PLACES_DATED)
    rec.branch[place] = { id: branch[place], fields: { organisationId: orgOf(place), id: branch[place], branchId: branch[place] } };
  // Background work: a failed task of each organisation, for the owner's "try again".
  rec.task = {} as Record<Place, { id: number; fields: Record<string, unknown> }>;
  for (const place of PLACES_UNDATED) {
    const at = NOW.toISOString();
    const [row] = await h.t
      .db("background_tasks")
      .insert({
        kind: "digest",
        payload: JSON.stringify({ organisationId: orgOf(place), place }),
        unique_key: `matrix:${place}`,
        organisation_id: orgOf(place),
        state: "failed",
        attempts: 5,
        max_attempts: 5,
        run_after: at,
        last_error: "Permission matrix: a task that failed",
        created_at: at,
        updated_at: at,
        finished_at: at,
      })
      .returning("id");
    rec.task[place] = { id: Number(typeof row === "object" ? row.id : row), fields: { organisationId: orgOf(place) } };
  }
  rec.grant = {} as Record<Place, { id: number; fields: Record<string, unknown> }>;
  const grant = await h.t.db("inspector_grants").whereNull("revoked_at").first();
  for (const place of PLACES_DATED) rec.grant[place] = { id: Number(grant.id), fields: { organisationId: 1 } };

  // Imports: one waiting for its mapping in each place's branch, uploaded through the route itself.
  rec.import = {} as Record<Place, { id: number; fields: Record<string, unknown> }>;
  for (const place of PLACES_UNDATED) {
    h.signInAs(place === "otherOrg" ? "other_org_manager" : "owner");
    const form = new FormData();
    form.set("kind", "cylinders");
    form.set("branchId", String(branch[place]));
    form.set("file", new Blob(["serial,refrigerant\nMX-1,R-410A\n"], { type: "text/csv" }), "cylinders.csv");
    const res = await h.call("imports", "POST", { form });
    if (res.status !== 201) throw new Error(`import upload at ${place}: ${res.status} ${res.text}`);
    rec.import[place] = { id: Number(res.json!.id), fields: { organisationId: orgOf(place), branchId: branch[place] } };
  }
  rec.import.window = rec.import.other;
  // Evidence of each place's finding.
  rec.evidence = {} as Record<Place, { id: number; fields: Record<string, unknown> }>;
  for (const place of PLACES_DATED) {
    const f = rec.finding[place];
    const [row] = await h.t
      .db("evidence")
      .insert({
        organisation_id: orgOf(place),
        subject_type: "finding",
        subject_id: f.id,
        file_key: `matrix/${place}.png`,
        file_name: "evidence.png",
        mime: "image/png",
        size_bytes: 100,
        uploaded_by: place === "otherOrg" ? h.actors.other_org_manager.userId : h.actors.owner.userId,
        uploaded_at: "2026-11-30T10:00:00.000Z",
      })
      .returning("id");
    rec.evidence[place] = { id: Number(row.id ?? row), fields: f.fields };
  }
  // Files the reads serve: each card's file, and evidence of each place's equipment.
  for (const place of PLACES_DATED) {
    const c = await h.t.db("certifications").where({ id: rec.card[place].id }).first();
    if (c.card_file_key) h.storage.files.set(c.card_file_key, { bytes: cardPng(16, 16), mime: c.card_mime ?? "image/png" });
    if (c.card_thumbnail_key) h.storage.files.set(c.card_thumbnail_key, { bytes: cardPng(8, 8), mime: "image/jpeg" });
  }
  for (const place of PLACES_UNDATED) {
    h.signInAs(place === "otherOrg" ? "other_org_manager" : "owner");
    const form = new FormData();
    form.set("file", new Blob([new Uint8Array(cardPng(32, 20))], { type: "image/png" }), "label.png");
    const res = await h.call("equipment/[id]/evidence", "POST", { params: { id: String(rec.equipment[place].id) }, form });
    if (res.status !== 201) throw new Error(`evidence at ${place}: ${res.status} ${res.text}`);
  }
  // Saved views and notifications belong to one person: "own" is the caller's, other places someone else's.
  h.session.signedIn = null;
  defineEntries();
}, 240_000);

afterAll(async () => {
  console.info(`permission matrix: ${tally.allowed} allowed and ${tally.refused} refused calls checked`);
  vi.resetModules();
  await h?.t.destroy();
});

function defineEntries() {
  const finding = (action: Action) => onRecord("finding", action, "Finding");
  const findingPost = (action: Action, body: unknown): Check => ({
    request: (p) => ({ ...idOf("finding")(p), body }),
    allowed: finding(action),
    places: PLACES_DATED,
  });
  const dated = (kind: string, name: SubjectName, action: Action, body?: (p: Place) => unknown): Check => ({
    request: (p) => ({ ...idOf(kind)(p), ...(body ? { body: body(p) } : {}) }),
    allowed: onRecord(kind, action, name),
    places: PLACES_DATED,
  });
  const register = (kind: string, name: SubjectName, action: Action, body?: (p: Place) => unknown): Check => ({
    request: (p) => ({ ...idOf(kind)(p), ...(body ? { body: body(p) } : {}) }),
    allowed: onRecord(kind, action, name),
  });
  const list = (action: Action, name: SubjectName, query?: string): Check => ({
    request: same(query ? { query } : {}),
    allowed: typeLevel(action, name),
    places: ["own"],
  });
  const orgWide = (action: Action, name: SubjectName): Check => ({
    request: same(),
    allowed: (a, p) => a.can(action, subject(name, { organisationId: orgOf(p) })),
    places: ["own"],
  });
  const card = (action: Action, body?: unknown): Check => ({
    request: (p) => ({ ...idOf("card")(p), ...(body ? { body } : {}) }),
    allowed: async (a, p) => {
      const ref = await getCertificationRef(h.t.db, { organisationId: orgOf(p), id: rec.card![p].id });
      return ref !== undefined && canOnCertification(a, "read", ref) && canOnCertification(a, action, ref);
    },
  });
  const person = (action: Action, name: SubjectName = "User", body?: unknown): Check => ({
    request: (p) => ({ ...idOf("person")(p), ...(body ? { body } : {}) }),
    allowed: (a, p) => {
      const f = rec.person![p].fields;
      return (
        a.can("read", subject("User", { ...f })) &&
        a.can(action, subject(name, { organisationId: f.organisationId, id: f.id, userId: f.id, branchId: f.branchId }))
      );
    },
  });
  const importCheck = (action: Action, extra: Partial<Check> = {}): Check => ({
    request: idOf("import"),
    allowed: (a, p) =>
      a.can("read", subject("Import", { ...rec.import![p].fields })) &&
      (action === "read" ||
        (a.can("create", subject("Import", { ...rec.import![p].fields })) &&
          a.can("create", subject("Cylinder", { ...rec.import![p].fields })))),
    ...extra,
  });
  const branchCreate = (
    name: SubjectName,
    body: (p: Place) => unknown,
    extra: (p: Place) => Record<string, unknown> = () => ({}),
  ): Check => ({
    request: (p) => ({ body: body(p) }),
    allowed: inBranch("create", name, extra),
  });
  const today = "2026-11-30";
  const jobBody = (p: Place) => ({
    kind: "verification_test",
    applianceId: recId("appliance", p),
    performedOn: "2026-11-20",
    verificationStage: "initial",
    verificationPassed: true,
    verificationMethod: "Bubble test",
  });

  Object.assign(ENTRIES, {
    "admin/branches": {
      GET: list("read", "Branch"),
      POST: {
        request: same({ body: { name: "Matrix Branch", code: "MTX", timeZone: "America/Denver", massUnit: "lb" } }),
        allowed: (a: AppAbility) => a.can("create", subject("Branch", { organisationId: 1 })),
        places: ["own"],
      },
    },
    "admin/branches/[id]": {
      GET: register("branch", "Branch", "read"),
      PATCH: {
        request: (p: Place) => ({ ...idOf("branch")(p), body: { name: `Branch ${p}` } }),
        allowed: (a: AppAbility, p: Place) =>
          a.can("read", subject("Branch", { ...rec.branch![p].fields })) &&
          a.can("update", subject("Branch", { ...rec.branch![p].fields })),
      },
    },
    "admin/inspector-grants": {
      GET: list("read", "InspectorGrant"),
      POST: {
        request: same({
          body: {
            email: "matrix.inspector@review.example",
            name: "Matrix Inspector",
            branchIds: [branch.other],
            recordsFrom: "2025-01-01",
            recordsTo: "2025-12-31",
            expiresOn: "2027-01-31",
          },
        }),
        allowed: (a: AppAbility) => a.can("create", subject("InspectorGrant", { organisationId: 1 })),
        places: ["own"],
      },
    },
    "admin/inspector-grants/[id]/invitation": {
      POST: {
        request: idOf("grant"),
        allowed: (a: AppAbility) =>
          a.can("read", subject("InspectorGrant", { organisationId: 1 })) &&
          a.can("invite", subject("InspectorGrant", { organisationId: 1 })),
        places: ["own"],
      },
    },
    "admin/inspector-grants/[id]/revoke": {
      POST: {
        request: idOf("grant"),
        allowed: (a: AppAbility) =>
          a.can("read", subject("InspectorGrant", { organisationId: 1 })) &&
          a.can("update", subject("InspectorGrant", { organisationId: 1 })),
        places: ["own"],
      },
    },
    "admin/invitations": {
      POST: {
        request: (p: Place) => ({
          body: { email: `matrix.${p}@invited.example`, name: "Matrix Person", roles: ["technician"], branchIds: [branch[p]] },
        }),
        allowed: (a: AppAbility, p: Place) => a.can("invite", subject("User", { organisationId: orgOf(p), branchId: branch[p] })),
      },
    },
    "admin/people": { GET: list("read", "User") },
    "account/password": {
      POST: {
        // A wrong current password: allowed roles get a 400 naming it, nobody's password changes.
        request: same({
          body: {
            currentPassword: "not the current password",
            password: "a fresh and long pass phrase",
            confirmPassword: "a fresh and long pass phrase",
          },
        }),
        allowed: typeLevel("update", "Account"),
        places: ["own"],
      },
    },
    "account/sign-out-everywhere": { POST: { request: same(), allowed: typeLevel("update", "Account"), places: ["own"] } },
    "admin/people/[id]": {
      GET: person("read"),
      PATCH: {
        ...person("update", "Membership"),
        request: (p: Place) => ({ ...idOf("person")(p), body: { roles: ["technician"], branchIds: [branch[p]] } }),
      },
    },
    "admin/people/[id]/certifications": { GET: person("read", "Certification") },
    "admin/people/[id]/deactivate": { POST: person("update") },
    "admin/people/[id]/reactivate": { POST: person("update") },
    "admin/people/[id]/history": { GET: person("read", "Activity") },
    "admin/people/[id]/invitation": { POST: person("invite"), DELETE: person("invite") },
    "admin/background/[id]/retry": {
      POST: { request: idOf("task"), allowed: onRecord("task", "update", "Settings"), places: ["own", "otherOrg"] },
    },
    "admin/settings": {
      GET: orgWide("read", "Settings"),
      PUT: {
        request: same({ body: { name: "Kestrelmoor Mechanical", rulePacks: ["us_federal"] } }),
        allowed: (a: AppAbility) => a.can("update", subject("Settings", { organisationId: 1 })),
        places: ["own"],
      },
    },
    appliances: {
      GET: list("read", "Appliance"),
      POST: branchCreate("Appliance", (p) => ({
        branchId: branch[p],
        siteChoice: "new",
        newSiteName: "Matrix site",
        customerChoice: "none",
        tag: unique("MX-RTU"),
        description: "Rooftop unit added by the permission matrix",
        category: "packaged_rooftop",
        refrigerant: "r410a",
        fullChargeAmount: 12.5,
        fullChargeUnit: "lb",
        fullChargeMethod: "nameplate",
        factorySealed: false,
      })),
    },
    "appliances/[id]": {
      GET: register("appliance", "Appliance", "read"),
      PATCH: {
        ...register("appliance", "Appliance", "update"),
        request: async (p: Place) => ({ ...idOf("appliance")(p), body: await appliancePatchBody(recId("appliance", p)) }),
      },
    },
    "appliances/[id]/history": { GET: register("appliance", "Appliance", "read") },
    "appliances/[id]/status": {
      POST: register("appliance", "Appliance", "update", () => ({ status: "retired", on: today, reason: "Permission matrix check" })),
    },
    "appliances/customers": { GET: list("read", "Customer") },
    "appliances/sites": { GET: list("read", "Site") },
    audits: {
      GET: list("read", "Audit"),
      POST: {
        request: same({ body: { branchIds: [branch.own], periodFrom: "2026-01-01", periodTo: "2026-06-30", packs: ["us_federal"] } }),
        allowed: (a: AppAbility) => a.can("run", subject("Audit", { organisationId: 1 })),
        places: ["own"],
      },
    },
    "audits/[id]": {
      GET: { request: idOf("audit"), allowed: (a: AppAbility, p: Place) => a.can("read", subject("Audit", { organisationId: orgOf(p) })) },
    },
    "audits/[id]/export": {
      GET: {
        request: idOf("audit"),
        allowed: (a: AppAbility, p: Place) => a.can("export", subject("Audit", { organisationId: orgOf(p) })),
      },
    },
    "audits/[id]/rerun": {
      POST: { request: idOf("audit"), allowed: (a: AppAbility, p: Place) => a.can("run", subject("Audit", { organisationId: orgOf(p) })) },
    },
    // next-auth's own handler (its sign-in callback is covered by the sign-in tests): only checked not to fail.
    "auth/[...nextauth]": {
      GET: { request: same({ params: { nextauth: ["session"] } as never }), allowed: () => true, public: true, places: ["own"] },
      POST: { request: same({ params: { nextauth: ["_log"] } as never, body: {} }), allowed: () => true, public: true, places: ["own"] },
    },
    certifications: {
      GET: list("read", "Certification"),
      POST: {
        request: () => {
          const form = new FormData();
          form.append("types", "type_i");
          form.set("certifyingOrganisation", "Matrix Testing Body");
          form.set("certificateNumber", `MX-${Math.random().toString(36).slice(2, 8)}`);
          form.set("issuedOn", "2024-05-01");
          form.set("card", new Blob([new Uint8Array(cardPng(64, 40))], { type: "image/png" }), "card.png");
          return { form };
        },
        allowed: (a: AppAbility, _p: Place, role: RoleKey) =>
          a.can("create", subject("Certification", { organisationId: h.actors[role].organisationId, userId: h.actors[role].userId })),
        places: ["own"],
      },
    },
    "certifications/[id]": { GET: card("read") },
    "certifications/[id]/corrections": { POST: card("update", { reason: "Permission matrix check", certificateNumber: "MX-CORRECTED" }) },
    "certifications/[id]/decision": { POST: card("verify", { decision: "reject", reason: "Permission matrix check of the decision" }) },
    "certifications/[id]/withdraw": { POST: card("void", { reason: "Permission matrix check" }) },
    "files/certifications/[id]": { GET: card("read") },
    cylinders: {
      GET: list("read", "Cylinder"),
      POST: branchCreate("Cylinder", (p) => ({
        branchId: branch[p],
        serial: unique("MX-C"),
        waterCapacityAmount: 50,
        waterCapacityUnit: "lb",
        tareAmount: 17.5,
        tareUnit: "lb",
        lastRequalifiedOn: "2025-01-10",
      })),
    },
    "cylinders/[id]": {
      GET: register("cylinder", "Cylinder", "read"),
      PATCH: {
        ...register("cylinder", "Cylinder", "update"),
        request: async (p: Place) => ({ ...idOf("cylinder")(p), body: await cylinderPatchBody(recId("cylinder", p)) }),
      },
    },
    "cylinders/[id]/movements": { GET: register("cylinder", "Cylinder", "read") },
    "cylinders/[id]/weighings": {
      GET: register("cylinder", "Cylinder", "read"),
      POST: {
        ...register("cylinder", "Cylinder", "update"),
        request: async (p: Place) => {
          const c = await h.t
            .db("cylinders")
            .where({ id: recId("cylinder", p) })
            .first();
          return { ...idOf("cylinder")(p), body: { weighedOn: today, grossAmount: Number(c.tare_g) + 1000, grossUnit: "g" } };
        },
      },
    },
    "cylinders/[id]/weighings/[weighingId]": {
      PATCH: {
        request: async (p: Place) => ({
          params: { id: String(rec.weighing![p].fields.cylinderId), weighingId: String(rec.weighing![p].id) },
          body: await weighingBody(rec.weighing![p].id),
        }),
        allowed: onRecord("weighing", "update", "Cylinder"),
      },
    },
    "cylinders/[id]/weighings/[weighingId]/void": {
      POST: {
        request: (p: Place) => ({
          params: { id: String(rec.weighing![p].fields.cylinderId), weighingId: String(rec.weighing![p].id) },
          body: reason,
        }),
        allowed: onRecord("weighing", "update", "Cylinder"),
      },
    },
    "dashboard/branches/[id]": {
      GET: {
        request: idOf("branch"),
        allowed: (a: AppAbility, p: Place) =>
          a.can("read", subject("Branch", { organisationId: orgOf(p), id: branch[p] })) &&
          a.can("read", "Finding") &&
          !a.rulesFor("read", "Finding").every((r) => r.conditions && "technicianId" in (r.conditions as object)),
      },
    },
    "dashboard/overview": { GET: list("read", "Finding") },
    disposals: { GET: list("read", "Disposal", "type=record") },
    "disposals/monthly": {
      GET: {
        request: (p: Place) => ({ query: `branchId=${branch[p]}&year=2025` }),
        allowed: (a: AppAbility, p: Place) => a.can("read", subject("Disposal", { organisationId: orgOf(p), branchId: branch[p] })),
      },
    },
    "disposals/records": {
      POST: branchCreate("Disposal", (p) => ({
        applianceId: recId("appliance", p),
        disposedOn: "2026-11-20",
        companyName: "Matrix Salvage",
        applianceLocation: "Back lot",
        recoveredOn: "2026-11-19",
        refrigerant: "R-410A",
        recoveredAmount: 2,
        recoveredUnit: "lb",
      })),
    },
    "disposals/records/[id]": {
      GET: dated("disposalRecord", "Disposal", "read"),
      PATCH: dated("disposalRecord", "Disposal", "update", () => ({ ...reason, changes: { companyName: "Matrix Salvage" } })),
    },
    "disposals/records/[id]/void": { POST: dated("disposalRecord", "Disposal", "void", () => reason) },
    "disposals/shop": {
      GET: list("create", "Job"),
      POST: branchCreate(
        "Job",
        (p) => ({
          performedOn: "2026-11-20",
          cylinderId: recId("cylinder", p),
          equipmentId: recId("equipment", p),
          accessMethod: "service_valve",
          temporaryAccessRemoved: null,
          confirmStatement: true,
          items: [
            { applianceId: recId("appliance", p), recoveredAmount: 1, recoveredUnit: "lb", evacuationValue: 0, evacuationUnit: "psig" },
          ],
        }),
        () => ({ technicianId: h.session.signedIn?.actor.userId ?? 0 }),
      ),
    },
    "disposals/statements": {
      POST: branchCreate("Disposal", (p) => ({
        applianceId: recId("appliance", p),
        recoveredByName: "Matrix Recovery Co",
        recoveredByAddress: "1 Test Road",
        recoveredOn: "2026-11-19",
        signedByName: "Matrix Signer",
        signedOn: "2026-11-20",
      })),
    },
    "disposals/statements/[id]": {
      GET: dated("statement", "Disposal", "read"),
      PATCH: dated("statement", "Disposal", "update", () => ({ ...reason, changes: { contractReference: "MX-1" } })),
    },
    "disposals/statements/[id]/document": {
      GET: dated("statement", "Disposal", "read"),
      POST: {
        request: (p: Place) => {
          const form = new FormData();
          form.set("reason", "Permission matrix check");
          form.set("document", new Blob([new Uint8Array(cardPng(32, 20))], { type: "image/png" }), "signed.png");
          return { ...idOf("statement")(p), form };
        },
        allowed: (a: AppAbility, p: Place) =>
          onRecord("statement", "read", "Disposal")(a, p) && onRecord("statement", "update", "Disposal")(a, p),
        places: PLACES_DATED,
      },
    },
    "disposals/statements/[id]/void": { POST: dated("statement", "Disposal", "void", () => reason) },
    equipment: {
      GET: list("read", "RecoveryEquipment"),
      POST: branchCreate("RecoveryEquipment", (p) => ({ branchId: branch[p], serial: unique("MX-RE"), certificationState: "unknown" })),
    },
    "equipment/[id]": {
      GET: register("equipment", "RecoveryEquipment", "read"),
      PATCH: {
        ...register("equipment", "RecoveryEquipment", "update"),
        request: async (p: Place) => ({ ...idOf("equipment")(p), body: await equipmentPatchBody(recId("equipment", p)) }),
      },
    },
    "equipment/[id]/evidence": {
      GET: register("equipment", "RecoveryEquipment", "read"),
      POST: {
        request: (p: Place) => {
          const form = new FormData();
          form.set("file", new Blob([new Uint8Array(cardPng(32, 20))], { type: "image/png" }), "label.png");
          return { ...idOf("equipment")(p), form };
        },
        allowed: onRecord("equipment", "update", "RecoveryEquipment"),
      },
    },
    findings: { GET: list("read", "Finding") },
    "findings/[id]": { GET: { request: idOf("finding"), allowed: finding("read"), places: PLACES_DATED } },
    "findings/[id]/accept": { POST: findingPost("accept", {}) },
    "findings/[id]/comments": { POST: findingPost("comment", { body: "Permission matrix comment" }) },
    "findings/[id]/evidence": {
      POST: {
        request: (p: Place) => {
          const form = new FormData();
          form.set("file", new Blob([new Uint8Array(cardPng(32, 20))], { type: "image/png" }), "photo.png");
          return { ...idOf("finding")(p), form };
        },
        allowed: finding("comment"),
        places: PLACES_DATED,
      },
    },
    "findings/[id]/evidence/[evidenceId]": {
      GET: {
        request: (p: Place) => ({ params: { id: String(rec.finding![p].id), evidenceId: String(rec.evidence![p].id) } }),
        allowed: finding("read"),
        places: PLACES_DATED,
      },
    },
    "findings/[id]/propose-fix": { POST: findingPost("propose_fix", { note: "Permission matrix: repaired and re-tested" }) },
    "findings/[id]/reopen": { POST: findingPost("reopen", { reason: "Permission matrix reopening" }) },
    "findings/[id]/waive": { POST: findingPost("waive", { reason: "Permission matrix: no fix is needed here" }) },
    "findings/assign": {
      POST: {
        request: (p: Place) => ({ body: { findingIds: [rec.finding![p].id], assigneeId: null } }),
        allowed: finding("assign"),
        places: PLACES_DATED,
      },
    },
    "findings/assignees": { GET: list("assign", "Finding") },
    "findings/digest": { POST: list("read", "Finding") },
    imports: {
      GET: list("read", "Import"),
      POST: {
        request: (p: Place) => {
          const form = new FormData();
          form.set("kind", "cylinders");
          form.set("branchId", String(branch[p]));
          form.set("file", new Blob(["serial,refrigerant\nMX-2,R-410A\n"], { type: "text/csv" }), "more.csv");
          return { form };
        },
        allowed: (a: AppAbility, p: Place) => inBranch("create", "Import")(a, p) && inBranch("create", "Cylinder")(a, p),
      },
    },
    "imports/[id]": { GET: importCheck("read") },
    "imports/[id]/issues": { GET: importCheck("read") },
    "imports/[id]/mapping": {
      PUT: {
        ...importCheck("create"),
        request: (p: Place) => ({ ...idOf("import")(p), body: { mapping: { serial: 0, refrigerant: 1 } } }),
      },
    },
    "imports/[id]/commit": { POST: importCheck("create") },
    "imports/[id]/cancel": { POST: importCheck("create") },
    "imports/template": { GET: list("create", "Import", "kind=cylinders") },
    "invitation/accept": {
      POST: {
        request: same({
          body: {
            token: "x".repeat(43),
            name: "Nobody",
            password: "a long enough pass phrase",
            confirmPassword: "a long enough pass phrase",
          },
        }),
        allowed: () => false,
        public: true,
        places: ["own"],
      },
    },
    jobs: {
      GET: list("read", "Job"),
      POST: branchCreate(
        "Job",
        (p) => jobBody(p),
        () => ({ technicianId: h.session.signedIn?.actor.userId ?? 0 }),
      ),
    },
    "jobs/[id]": {
      GET: dated("job", "Job", "read"),
      PATCH: dated("job", "Job", "update", () => ({ ...reason, changes: { notes: "Permission matrix note" } })),
    },
    "jobs/[id]/void": { POST: dated("job", "Job", "void", () => reason) },
    "jobs/[id]/findings": { GET: dated("job", "Job", "read") },
    "jobs/check": {
      POST: branchCreate(
        "Job",
        (p) => jobBody(p),
        () => ({ technicianId: h.session.signedIn?.actor.userId ?? 0 }),
      ),
    },
    "lookup/appliances": { GET: list("read", "Appliance") },
    "lookup/branches": { GET: list("read", "Branch") },
    "lookup/cylinders": { GET: list("read", "Cylinder") },
    "lookup/equipment": { GET: list("read", "RecoveryEquipment") },
    notifications: { GET: list("read", "Branch") },
    "notifications/read": { POST: { request: same({ body: { all: true } }), allowed: typeLevel("read", "Branch"), places: ["own"] } },
    "password/forgot": {
      POST: { request: same({ body: { email: "nobody@nowhere.example" } }), allowed: () => true, public: true, places: ["own"] },
    },
    "password/reset": {
      POST: {
        request: same({
          body: { token: "x".repeat(43), password: "a long enough pass phrase", confirmPassword: "a long enough pass phrase" },
        }),
        allowed: () => false,
        public: true,
        places: ["own"],
      },
    },
    purchases: {
      GET: list("read", "Purchase"),
      POST: branchCreate("Purchase", (p) => ({
        branchId: branch[p],
        purchasedOn: "2026-11-20",
        supplierName: "Matrix Supply",
        refrigerant: "R-410A",
        amount: 25,
        unit: "lb",
      })),
    },
    "purchases/[id]": {
      GET: dated("purchase", "Purchase", "read"),
      PATCH: dated("purchase", "Purchase", "update", () => ({ ...reason, changes: { supplierName: "Matrix Supply" } })),
    },
    "purchases/[id]/void": { POST: dated("purchase", "Purchase", "void", () => reason) },
    "saved-views": {
      GET: list("read", "Finding"),
      POST: { request: same({ body: { name: "Matrix view", query: {} } }), allowed: typeLevel("read", "Finding"), places: ["own"] },
    },
    "saved-views/[id]": { DELETE: { request: same({ params: { id: "999999" } }), allowed: () => false, places: ["own"] } },
    shipments: {
      GET: list("read", "ReclaimShipment"),
      POST: branchCreate("ReclaimShipment", (p) => ({
        branchId: branch[p],
        shippedOn: "2026-11-20",
        reclaimerName: "Matrix Reclaim",
        cylinderIds: [recId("cylinder", p)],
      })),
    },
    "shipments/[id]": {
      GET: dated("shipment", "ReclaimShipment", "read"),
      PATCH: dated("shipment", "ReclaimShipment", "update", () => ({ ...reason, changes: { reference: "MX-REF" } })),
    },
    "shipments/[id]/void": { POST: dated("shipment", "ReclaimShipment", "void", () => reason) },
  } satisfies Record<string, Entry>);
}

describe("the permission matrix", () => {
  it("has an entry for every route file and every method it exports", async () => {
    const missing: string[] = [];
    let handlers = 0;
    for (const route of routeFiles()) {
      const mod = await h.load(route);
      for (const method of METHODS) {
        if (!mod[method]) continue;
        handlers++;
        if (!ENTRIES[route]?.[method]) missing.push(`${method} ${route}`);
      }
      for (const method of Object.keys(ENTRIES[route] ?? {}) as Method[]) {
        if (!mod[method]) missing.push(`${method} ${route} has an entry but is not exported`);
      }
    }
    expect(missing).toEqual([]);
    expect(routeFiles().length).toBeGreaterThanOrEqual(90);
    console.info(`permission matrix: ${routeFiles().length} route files, ${handlers} handlers`);
  });

  it("signed out, every route except the public ones answers 401 and writes nothing", async () => {
    h.signInAs(null);
    const before = await h.fingerprint();
    for (const [route, entry] of Object.entries(ENTRIES)) {
      for (const [method, check] of Object.entries(entry) as [Method, Check][]) {
        if (check.public) continue;
        const res = await h.call(route, method, await check.request((check.places ?? PLACES_UNDATED)[0]!));
        expect(res.status, `${method} ${route}`).toBe(401);
      }
    }
    expect(await h.fingerprint()).toBe(before);
  });

  for (const role of ROLES) {
    it(`${role}: every route, every method, every place answers as the permission rules say`, async () => {
      const ability = h.signInAs(role)!;
      const problems: string[] = [];
      let calls = 0;
      for (const [route, entry] of Object.entries(ENTRIES)) {
        for (const [method, check] of Object.entries(entry) as [Method, Check][]) {
          if (check.public) continue;
          for (const place of check.places ?? PLACES_UNDATED) {
            const allowed = await check.allowed(ability, place, role);
            const before = allowed ? "" : await h.fingerprint();
            const res = await h.call(route, method, await check.request(place));
            calls++;
            tally[allowed ? "allowed" : "refused"]++;
            const label = `${role} ${method} ${route} @${place}: expected ${allowed ? "allowed" : "refused"}, got ${res.status} ${res.text.slice(0, 160)}`;
            if (res.status >= 500) problems.push(label);
            else if (allowed && [401, 403, 404].includes(res.status)) problems.push(label);
            else if (!allowed) {
              // Refused: 403 (not allowed), 404 (not even readable), or 400 naming the field when the body
              // points at a record or branch of another organisation (answered as "not in your organisation").
              const crossOrg = res.status === 400 && /(not in your organisation|of your organisation)/.test(res.text);
              if (![403, 404].includes(res.status) && !crossOrg) problems.push(label);
              else if ((await h.fingerprint()) !== before) problems.push(`${label} — and rows changed`);
            }
          }
        }
      }
      expect(problems).toEqual([]);
      expect(calls).toBeGreaterThan(100);
    });
  }
});
