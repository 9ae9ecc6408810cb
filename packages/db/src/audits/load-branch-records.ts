import type { Knex } from "knex";
import {
  addDays,
  normaliseDesignation,
  toLocalDate,
  type AuditPeriod,
  type BranchRecords,
  type CertificationState,
  type CertificationType,
  type EquipmentCertificationState,
  type EvacuationUnit,
  type Job,
  type MassDisplayUnit,
  type RecoveryEquipmentKind,
  type RefrigerantMovement,
  type StockCount,
  type Technician,
} from "@coldtrail/core";
import { RecordNotFoundError } from "../errors";
import { toBool, toBoolOrNull, toNumOrNull } from "../types";

type Row = Record<string, any>;

export interface LoadedBranch {
  id: number;
  organisationId: number;
  name: string;
  code: string;
  timeZone: string;
  massUnit: MassDisplayUnit;
}

export interface LoadedBranchRecords {
  branch: LoadedBranch;
  records: BranchRecords;
  /** The calendar date (branch zone) the records were read for. */
  asOf: string;
  /** Jobs in the period plus appliances, cylinders, recovery equipment and certifications: the basis of record health. */
  recordsAudited: number;
}

/** Signs of each movement direction in the branch's holdings of refrigerant. */
const HOLDING_SIGN: Record<string, number> = {
  purchased: 1,
  recovered_into_cylinder: 1,
  charged_from_cylinder: -1,
  charged_from_stock: -1,
  shipped_for_reclaim: -1,
};

const EXCLUSIONS: Record<string, Job["additionExclusion"]> = {
  retrofit: "retrofit",
  installation: "installation",
  seasonal: "seasonal_variance",
  seasonal_variance: "seasonal_variance",
};

const CHUNK = 500;

/** Runs `fetch` over `ids` in chunks (SQLite and PostgreSQL both limit bound parameters). */
async function inChunks<T>(ids: number[], fetch: (chunk: number[]) => Promise<T[]>): Promise<T[]> {
  const out: T[] = [];
  for (let i = 0; i < ids.length; i += CHUNK) out.push(...(await fetch(ids.slice(i, i + CHUNK))));
  return out;
}

function addTo(map: Map<string, number>, refrigerant: string, grams: number): void {
  const key = normaliseDesignation(refrigerant);
  map.set(key, (map.get(key) ?? 0) + grams);
}

/**
 * Reads everything the audit engine needs about one branch, once, and maps it to the core's
 * `BranchRecords`: appliances (with their site as location), registered recovery equipment and
 * cylinders (placeholders flagged `unregistered` are left out, so jobs naming them are reported as
 * missing from the register), every job that is not voided up to `asOf` with its refrigerant
 * movements, the technicians who work there or are named on its jobs with their certifications (one
 * core certification per type held), disposal records and statements, reclaim shipments, purchases
 * and weighings.
 *
 * Cylinders start from an opening balance — what the register holds beyond everything recorded — and
 * the engine replays their movements. Stock counts for the mass balance are derived: the opening
 * count (day before the period) is the book holding from the movements; the closing count is the book
 * holding on the last day, except when the period reaches `asOf`, where the cylinders' registered
 * contents are the count (refrigerant that left a cylinder unrecorded then shows as unaccounted).
 * Virgin stock on the shelf has no physical count and stays at its book value.
 */
export async function loadBranchRecords(
  db: Knex,
  opts: { organisationId: number; branchId: number; period: AuditPeriod; asOf?: string | Date },
): Promise<LoadedBranchRecords> {
  const b = await db("branches as b")
    .join("organisations as o", "o.id", "b.organisation_id")
    .where({ "b.id": opts.branchId, "b.organisation_id": opts.organisationId })
    .first("b.id", "b.organisation_id", "b.name", "b.code", "b.time_zone", "b.mass_unit", "o.name as organisation_name");
  if (!b) throw new RecordNotFoundError("That branch does not exist", "branchId");
  const branch: LoadedBranch = {
    id: Number(b.id),
    organisationId: Number(b.organisation_id),
    name: b.name,
    code: b.code,
    timeZone: b.time_zone,
    massUnit: b.mass_unit as MassDisplayUnit,
  };
  const asOf = toLocalDate(opts.asOf ?? new Date(), branch.timeZone);
  const { period } = opts;

  const applianceRows = await db("appliances as a")
    .leftJoin("sites as s", "s.id", "a.site_id")
    .where("a.branch_id", branch.id)
    .orderBy("a.id")
    .select(
      "a.id",
      "a.tag",
      "a.description",
      "a.category",
      "a.refrigerant",
      "a.full_charge_g",
      "a.full_charge_method",
      "a.factory_sealed",
      "a.hermetically_sealed",
      "a.has_leak_detection",
      "a.industrial_shutdown_needed",
      "a.status",
      "a.installed_on",
      "a.retired_on",
      "a.disposed_on",
      "s.name as site_name",
      "s.address as site_address",
    );

  const equipmentRows = await db("recovery_equipment")
    .where({ branch_id: branch.id })
    .orderBy("id")
    .select("id", "serial", "manufactured_on", "certification_state", "small_appliance_only", "system_dependent", "unregistered");

  const cylinderRows = await db("cylinders").where({ branch_id: branch.id }).orderBy("id").select("*");
  const registeredCylinders = cylinderRows.filter((c) => !toBool(c.unregistered));
  const cylinderIds = registeredCylinders.map((c) => Number(c.id));

  // Net of every recorded movement per cylinder: what the register holds beyond it is the opening balance.
  const movedByCylinder = new Map<number, number>();
  for (const r of await inChunks(
    cylinderIds,
    (chunk) =>
      db("refrigerant_movements")
        .whereIn("cylinder_id", chunk)
        .whereNull("voided_at")
        .groupBy("cylinder_id", "direction")
        .select("cylinder_id", "direction")
        .sum({ g: "mass_g" }) as Promise<Row[]>,
  )) {
    const sign = r.direction === "recovered_into_cylinder" ? 1 : r.direction === "cylinder_adjustment" ? 0 : -1;
    movedByCylinder.set(Number(r.cylinder_id), (movedByCylinder.get(Number(r.cylinder_id)) ?? 0) + sign * Number(r.g));
  }

  const weighingRows = await inChunks(cylinderIds, (chunk) =>
    db("cylinder_weighings")
      .whereIn("cylinder_id", chunk)
      .whereNull("voided_at")
      .where("weighed_on", "<=", asOf)
      .orderBy("id")
      .select("id", "cylinder_id", "weighed_on", "gross_g", "net_g", "pressure_psig", "temperature_c"),
  );
  // A cylinder weighed on the day it is shipped for reclaim, holding at least what was shipped, was
  // weighed before it left. The engine replays a day's weighings after its shipments, so the reading
  // is handed over as what the scale shows once the shipped refrigerant is gone (gross − shipped).
  const shippedOnDay = new Map<string, number>();
  for (const r of await inChunks(
    cylinderIds,
    (chunk) =>
      db("reclaim_shipment_lines as l")
        .join("reclaim_shipments as s", "s.id", "l.shipment_id")
        .whereIn("l.cylinder_id", chunk)
        .whereNull("s.voided_at")
        .groupBy("l.cylinder_id", "s.shipped_on")
        .select("l.cylinder_id", "s.shipped_on")
        .sum({ g: "l.mass_g" }) as Promise<Row[]>,
  )) {
    shippedOnDay.set(`${r.cylinder_id}|${r.shipped_on}`, Number(r.g));
  }
  const weighingsByCylinder = new Map<number, BranchRecords["cylinders"][number]["weighings"]>();
  for (const w of weighingRows) {
    const list = weighingsByCylinder.get(Number(w.cylinder_id)) ?? [];
    const shipped = shippedOnDay.get(`${w.cylinder_id}|${w.weighed_on}`);
    const beforeShipment = shipped !== undefined && w.net_g !== null && Number(w.net_g) >= shipped;
    list.push({
      id: Number(w.id),
      on: w.weighed_on,
      grossG: w.gross_g === null ? null : Number(w.gross_g) - (beforeShipment ? (shipped as number) : 0),
      temperatureF: w.temperature_c === null || w.temperature_c === undefined ? null : (Number(w.temperature_c) * 9) / 5 + 32,
      pressurePsig: toNumOrNull(w.pressure_psig),
    });
    weighingsByCylinder.set(Number(w.cylinder_id), list);
  }

  const jobRows = await db("jobs")
    .where({ branch_id: branch.id })
    .whereNull("voided_at")
    .where("performed_on", "<=", asOf)
    .orderBy("id")
    .select(
      "id",
      "kind",
      "performed_on",
      "technician_id",
      "appliance_id",
      "equipment_id",
      "refrigerant",
      "evacuation_value",
      "evacuation_unit",
      "access_method",
      "temporary_access_removed",
      "compressor_operating",
      "addition_exclusion",
      "same_leak_as_job_id",
      "verification_stage",
      "verification_passed",
    );

  const movementRows = await db("refrigerant_movements as m")
    .join("jobs as j", "j.id", "m.job_id")
    .where("j.branch_id", branch.id)
    .whereNull("j.voided_at")
    .whereNull("m.voided_at")
    .where("j.performed_on", "<=", asOf)
    .whereIn("m.direction", ["recovered_into_cylinder", "charged_from_cylinder", "charged_from_stock"])
    .orderBy("m.id")
    .select("m.job_id", "m.direction", "m.cylinder_id", "m.refrigerant", "m.mass_g");
  const movementsByJob = new Map<number, RefrigerantMovement[]>();
  for (const m of movementRows) {
    const list = movementsByJob.get(Number(m.job_id)) ?? [];
    list.push({
      direction: m.direction === "recovered_into_cylinder" ? "recovered" : "charged",
      amountG: Number(m.mass_g),
      cylinderId: toNumOrNull(m.cylinder_id),
      refrigerant: m.refrigerant ?? null,
    });
    movementsByJob.set(Number(m.job_id), list);
  }

  const jobs: Job[] = jobRows.map((j) => ({
    id: Number(j.id),
    kind: j.kind,
    performedOn: j.performed_on,
    technicianId: toNumOrNull(j.technician_id),
    applianceId: toNumOrNull(j.appliance_id),
    equipmentId: toNumOrNull(j.equipment_id),
    refrigerant: j.refrigerant ?? null,
    movements: movementsByJob.get(Number(j.id)) ?? [],
    evacuation:
      j.evacuation_value !== null && j.evacuation_value !== undefined && j.evacuation_unit
        ? { value: Number(j.evacuation_value), unit: j.evacuation_unit as EvacuationUnit }
        : null,
    accessMethod: j.access_method ?? null,
    temporaryAccessRemoved: toBoolOrNull(j.temporary_access_removed),
    compressorOperating: toBoolOrNull(j.compressor_operating),
    additionExclusion: j.addition_exclusion ? (EXCLUSIONS[j.addition_exclusion] ?? null) : null,
    sameLeakAsJobId: toNumOrNull(j.same_leak_as_job_id),
    verification:
      j.kind === "verification_test" && j.verification_stage
        ? { stage: j.verification_stage === "follow_up" ? "follow_up" : "initial", passed: toBool(j.verification_passed) }
        : null,
  }));

  // Technicians: whoever works in the branch, and whoever its jobs name.
  const memberIds = (
    await db("memberships").where({ branch_id: branch.id, role: "technician", organisation_id: branch.organisationId }).select("user_id")
  ).map((r) => Number(r.user_id));
  const technicianIds = [...new Set([...memberIds, ...jobs.map((j) => j.technicianId).filter((id): id is number => id !== null)])].sort(
    (x, y) => x - y,
  );
  const userRows = await inChunks(technicianIds, (chunk) =>
    db("users").whereIn("id", chunk).where({ organisation_id: branch.organisationId }).select("id", "name"),
  );
  const certRows = await inChunks(technicianIds, (chunk) =>
    db("certifications as c")
      .join("certification_types as ct", "ct.certification_id", "c.id")
      .whereIn("c.user_id", chunk)
      .whereNull("c.voided_at")
      .orderBy([{ column: "c.id" }, { column: "ct.type" }])
      .select("c.id", "c.user_id", "c.state", "c.uploaded_at", "ct.type"),
  );
  const technicians: Technician[] = userRows
    .map((u) => ({
      id: Number(u.id),
      name: u.name as string,
      certifications: certRows
        .filter((c) => Number(c.user_id) === Number(u.id))
        .map((c) => ({
          id: Number(c.id),
          type: c.type as CertificationType,
          state: c.state as CertificationState,
          // The verification grace period runs from the day the card was added, in the branch's zone.
          addedOn: c.uploaded_at ? toLocalDate(String(c.uploaded_at), branch.timeZone) : null,
        })),
    }))
    .sort((x, y) => x.id - y.id);

  const disposalRecords = (
    await db("disposal_records").where({ branch_id: branch.id }).whereNull("voided_at").orderBy("id").select("*")
  ).map((d) => ({
    id: Number(d.id),
    applianceId: Number(d.appliance_id),
    // The record is the organisation's own; without a name typed on it, it carries the organisation's.
    companyName: (d.company_name as string | null | undefined) ?? (b.organisation_name as string),
    applianceLocation: d.appliance_location ?? null,
    recoveredOn: d.recovered_on ?? null,
    refrigerant: d.refrigerant ?? null,
    recoveredG: toNumOrNull(d.recovered_g),
  }));

  const disposalStatements = (
    await db("disposal_statements").where({ branch_id: branch.id }).whereNull("voided_at").orderBy("id").select("*")
  ).map((d) => ({
    id: Number(d.id),
    applianceId: Number(d.appliance_id),
    signedBy: d.signed_by_name ?? null,
    signedOn: d.signed_on ?? null,
    recoveredByName: d.recovered_by_name ?? null,
    recoveredByAddress: d.recovered_by_address ?? null,
    recoveredOn: d.recovered_on ?? null,
    contractReference: (d.contract_reference as string | null | undefined) ?? null,
  }));

  const shipmentRows = await db("reclaim_shipments")
    .where({ branch_id: branch.id })
    .whereNull("voided_at")
    .where("shipped_on", "<=", asOf)
    .orderBy("id")
    .select("id", "shipped_on", "reclaimer_name");
  const lineRows = await db("reclaim_shipment_lines as l")
    .join("reclaim_shipments as s", "s.id", "l.shipment_id")
    .where("s.branch_id", branch.id)
    .whereNull("s.voided_at")
    .orderBy("l.id")
    .select("l.shipment_id", "l.cylinder_id", "l.refrigerant", "l.mass_g");
  const linesByShipment = new Map<number, BranchRecords["reclaimShipments"][number]["lines"]>();
  for (const l of lineRows) {
    const list = linesByShipment.get(Number(l.shipment_id)) ?? [];
    list.push({ cylinderId: toNumOrNull(l.cylinder_id), refrigerant: l.refrigerant, amountG: Number(l.mass_g) });
    linesByShipment.set(Number(l.shipment_id), list);
  }
  const reclaimShipments = shipmentRows.map((s) => ({
    id: Number(s.id),
    shippedOn: s.shipped_on,
    reclaimer: s.reclaimer_name ?? null,
    lines: linesByShipment.get(Number(s.id)) ?? [],
  }));

  const purchases = (
    await db("purchases")
      .where({ branch_id: branch.id })
      .whereNull("voided_at")
      .where("purchased_on", "<=", asOf)
      .orderBy("id")
      .select("id", "purchased_on", "refrigerant", "mass_g")
  ).map((p) => ({ id: Number(p.id), on: p.purchased_on, refrigerant: p.refrigerant, amountG: Number(p.mass_g) }));

  const stockCounts = await deriveStockCounts(db, { branchId: branch.id, period, asOf });

  const appliances = applianceRows.map((a) => ({
    id: Number(a.id),
    label: a.tag as string,
    category: a.category,
    refrigerant: a.refrigerant,
    fullChargeG: toNumOrNull(a.full_charge_g),
    fullChargeMethod: a.full_charge_method ?? null,
    factorySealed: toBool(a.factory_sealed),
    status: a.status,
    statusChangedOn: a.disposed_on ?? a.retired_on ?? null,
    location: a.site_address ?? a.site_name ?? null,
    installedOn: a.installed_on ?? null,
    needsIndustrialShutdownForRepair: toBool(a.industrial_shutdown_needed),
    hasLeakDetectionSystem: toBool(a.has_leak_detection),
    hermeticallySealedLabelled: toBool(a.hermetically_sealed),
  }));

  const recoveryEquipment = equipmentRows
    .filter((e) => !toBool(e.unregistered))
    .map((e) => ({
      id: Number(e.id),
      serial: e.serial as string,
      kind: (toBool(e.system_dependent)
        ? "system_dependent"
        : toBool(e.small_appliance_only)
          ? "small_appliance"
          : "self_contained") as RecoveryEquipmentKind,
      manufacturedOn: e.manufactured_on ?? null,
      certification: e.certification_state as EquipmentCertificationState,
    }));

  const cylinders = registeredCylinders.map((c) => {
    const beyond = Number(c.contents_g) - (movedByCylinder.get(Number(c.id)) ?? 0);
    return {
      id: Number(c.id),
      serial: c.serial as string,
      waterCapacityG: Number(c.water_capacity_g),
      tareG: Number(c.tare_g),
      lastRequalifiedOn: c.last_requalified_on ?? null,
      requalificationYears: toNumOrNull(c.requalification_years),
      // A cylinder away at the reclaimer or retired is not being filled.
      status: (c.status === "in_service" ? "in_service" : "retired") as "in_service" | "retired",
      openingContents: beyond > 0 && c.refrigerant ? { refrigerant: c.refrigerant as string, netG: beyond } : null,
      weighings: weighingsByCylinder.get(Number(c.id)) ?? [],
    };
  });

  const records: BranchRecords = {
    branch: { id: branch.id, name: branch.name, timeZone: branch.timeZone, massUnit: branch.massUnit },
    appliances,
    recoveryEquipment,
    cylinders,
    jobs,
    technicians,
    disposalRecords,
    disposalStatements,
    reclaimShipments,
    purchases,
    stockCounts,
    leakInspections: [],
    chronicLeakReports: [],
  };
  const certificationCount = technicians.reduce((n, t) => n + new Set(t.certifications.map((c) => c.id)).size, 0);
  const jobsInPeriod = jobs.filter((j) => j.performedOn >= period.from && j.performedOn <= period.to).length;
  return {
    branch,
    records,
    asOf,
    recordsAudited: jobsInPeriod + appliances.length + cylinders.length + recoveryEquipment.length + certificationCount,
  };
}

/** Book holdings per refrigerant from the branch's movements dated on or before `through`. */
async function bookHoldings(db: Knex, branchId: number, through: string): Promise<Map<string, number>> {
  const rows = (await db("refrigerant_movements as m")
    .leftJoin("jobs as j", "j.id", "m.job_id")
    .leftJoin("reclaim_shipments as s", "s.id", "m.reclaim_shipment_id")
    .leftJoin("purchases as p", "p.id", "m.purchase_id")
    .where("m.branch_id", branchId)
    .whereNull("m.voided_at")
    .whereNull("j.voided_at")
    .whereNull("s.voided_at")
    .whereNull("p.voided_at")
    .where("m.moved_on", "<=", through)
    .whereIn("m.direction", Object.keys(HOLDING_SIGN))
    .groupBy("m.refrigerant", "m.direction")
    .select("m.refrigerant", "m.direction")
    .sum({ g: "m.mass_g" })) as Row[];
  const out = new Map<string, number>();
  for (const r of rows) addTo(out, r.refrigerant, (HOLDING_SIGN[r.direction] ?? 0) * Number(r.g));
  return out;
}

/** The opening and closing stock counts the mass balance compares the period's flows with. */
async function deriveStockCounts(db: Knex, opts: { branchId: number; period: AuditPeriod; asOf: string }): Promise<StockCount[]> {
  const { branchId, period, asOf } = opts;
  const openingOn = addDays(period.from, -1);
  const opening = await bookHoldings(db, branchId, openingOn);
  let closing: Map<string, number>;
  if (period.to >= asOf) {
    // Shelf stock from the book; each cylinder of the branch as registered (what is physically held):
    // a cylinder whose registered contents equal its movements keeps the book's split by refrigerant
    // (a mixed cylinder is registered under one name); one that does not counts what the register says.
    const all = await bookHoldings(db, branchId, asOf);
    const bookByCylinder = new Map<number, Map<string, number>>();
    const cylinderBook = new Map<string, number>();
    for (const r of (await db("refrigerant_movements as m")
      .leftJoin("jobs as j", "j.id", "m.job_id")
      .leftJoin("reclaim_shipments as s", "s.id", "m.reclaim_shipment_id")
      .where("m.branch_id", branchId)
      .whereNotNull("m.cylinder_id")
      .whereNull("m.voided_at")
      .whereNull("j.voided_at")
      .whereNull("s.voided_at")
      .where("m.moved_on", "<=", asOf)
      .whereIn("m.direction", ["recovered_into_cylinder", "charged_from_cylinder", "shipped_for_reclaim"])
      .groupBy("m.cylinder_id", "m.refrigerant", "m.direction")
      .select("m.cylinder_id", "m.refrigerant", "m.direction")
      .sum({ g: "m.mass_g" })) as Row[]) {
      const grams = (HOLDING_SIGN[r.direction] ?? 0) * Number(r.g);
      addTo(cylinderBook, r.refrigerant, grams);
      const id = Number(r.cylinder_id);
      const own = bookByCylinder.get(id) ?? new Map<string, number>();
      addTo(own, r.refrigerant, grams);
      bookByCylinder.set(id, own);
    }
    const registered = new Map<string, number>();
    for (const c of await db("cylinders").where({ branch_id: branchId }).select("id", "refrigerant", "contents_g")) {
      const own = bookByCylinder.get(Number(c.id)) ?? new Map<string, number>();
      const bookTotal = [...own.values()].reduce((sum, g) => sum + g, 0);
      if (bookTotal === Number(c.contents_g)) {
        for (const [key, g] of own) addTo(registered, key, g);
      } else if (c.refrigerant && Number(c.contents_g) > 0) {
        addTo(registered, c.refrigerant, Number(c.contents_g));
      }
    }
    closing = new Map();
    for (const key of new Set([...all.keys(), ...registered.keys()])) {
      closing.set(key, (all.get(key) ?? 0) - (cylinderBook.get(key) ?? 0) + (registered.get(key) ?? 0));
    }
  } else {
    closing = await bookHoldings(db, branchId, period.to);
  }
  const counts: StockCount[] = [];
  let id = 1;
  for (const key of [...new Set([...opening.keys(), ...closing.keys()])].sort()) {
    counts.push({ id: id++, on: openingOn, refrigerant: key, netG: opening.get(key) ?? 0 });
  }
  for (const key of [...new Set([...opening.keys(), ...closing.keys()])].sort()) {
    counts.push({ id: id++, on: period.to, refrigerant: key, netG: closing.get(key) ?? 0 });
  }
  return counts;
}
