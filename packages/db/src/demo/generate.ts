/**
 * Builds the demo data set in memory: an invented company with two years of records that are
 * complete and conforming, except for the gaps planted on purpose (README "Demo data").
 * Deterministic: a seeded PRNG, a fixed "today", a fixed password salt; no clock, no Math.random.
 */
import bcrypt from "bcryptjs";
import type { AccessMethod, CertificationType, EvacuationUnit, JobKind } from "@coldtrail/core";
import { describeMass } from "../mass";
import { Prng, addDays, dayOf, isoOf, stamp } from "./prng";
import {
  DEMO_HISTORY_FROM,
  DEMO_PASSWORD,
  DEMO_TODAY,
  EU_BRANCH,
  FLOATING_TECHNICIAN,
  MAIN_ORG,
  SECOND_ORG,
  type BranchSpec,
  type OrganisationSpec,
} from "./scenario";

export type Row = Record<string, unknown>;

/** Rows per table, with explicit ids in insertion order. */
export class DemoTables {
  readonly data = new Map<string, Row[]>();
  private readonly counters = new Map<string, number>();

  add(table: string, row: Row): Row & { id: number } {
    const id = (this.counters.get(table) ?? 0) + 1;
    this.counters.set(table, id);
    const full = { id, ...row };
    this.rows(table).push(full);
    return full;
  }

  push(table: string, row: Row): void {
    this.rows(table).push(row);
  }

  rows(table: string): Row[] {
    let list = this.data.get(table);
    if (!list) {
      list = [];
      this.data.set(table, list);
    }
    return list;
  }
}

// A fixed salt keeps the seed byte-for-byte reproducible; the demo password is public anyway.
const DEMO_SALT = "$2b$10$ColdtrailDemoSeedSalt.";
const LOW_PRESSURE = new Set(["R-11", "R-113", "R-123", "R-1233zd(E)", "R-514A"]);
const HYDROCARBONS = new Set(["R-290", "R-600a"]);
const LB = 453.59237;

const QUARTER_ENDS = ["2024-12-31", "2025-03-31", "2025-06-30", "2025-09-30", "2025-12-31", "2026-03-31", "2026-06-30", "2026-09-30"];
/** The Peoria shipments of these quarter ends were never recorded (planted gap G16). */
const UNRECORDED_SHIPMENTS = { branchCode: "PIA", dates: ["2026-03-31", "2026-06-30"] };

const BRANDS = ["Frostvale", "Nimbra", "Tessaly", "Polwyn", "Veradyne", "Hexley", "Orvane", "Quenby", "Callowmark", "Brisewick"];
const PLACES = [
  "Alderbank",
  "Willowmere",
  "Stonecrest",
  "Fernhollow",
  "Maple Terrace",
  "Brackenridge",
  "Sunhollow",
  "Ashby Row",
  "Linden Park",
  "Quarrystone",
  "Hartwell",
  "Briarwood",
  "Oakhaven",
  "Redfern",
  "Elmstead",
  "Highmoor",
  "Thornbury",
  "Wrenfield",
  "Larchvale",
  "Kettle Creek",
  "Pembrook",
  "Saltmarsh",
  "Gableview",
  "Copse Hill",
];
const STREETS = ["Juniper", "Tanager", "Millrace", "Cobalt", "Harrowgate", "Bellwether", "Sorrel", "Kilnworth", "Lantern", "Osprey"];
const STREET_KINDS = ["St", "Ave", "Rd", "Blvd", "Way", "Ct"];
const RECLAIMERS = [
  { name: "Brannock Reclaim Partners", address: "12 Cinder Row, Gary, IN 46402" },
  { name: "Southfork Refrigerant Reclamation", address: "5400 Mesquite Pkwy, Phoenix, AZ 85043" },
];
const SUPPLIERS = ["Copperline Refrigerant Supply", "Tallgrass HVAC Wholesale", "Bluestem Parts & Gas"];
const SCRAP_YARD = "Ridgeway Metal Recyclers";
const CERTIFYING_ORGS = ["Prairie Technical Testing Board", "Coastal Trades Examination Service"];
const EQUIPMENT_TESTER = "Midland Appliance Testing Laboratory";

// ---------------------------------------------------------------------------------------------
// In-memory model used while generating

interface TechModel {
  id: number;
  key: string;
  name: string;
  verifiedTypes: Set<CertificationType>;
  /** Kept out of generated work (planted-gap technicians). */
  plantedOnly: boolean;
}

interface BranchModel {
  id: number;
  orgId: number;
  spec: BranchSpec;
  managerId: number;
  techs: TechModel[];
  shopSiteId: number;
  sites: { id: number; kind: SiteKind; address: string; contact: string }[];
  cylinders: CylinderModel[];
  equipment: { general: EquipmentModel[]; small: EquipmentModel[] };
  reclaimer: { name: string; address: string };
}

type SiteKind = "grocery" | "residential" | "commercial";

interface ApplianceModel {
  row: Row & { id: number };
  branch: BranchModel;
  tag: string;
  category: string;
  refrigerant: string;
  chargeG: number;
  small: boolean;
  lowPressure: boolean;
  siteAddress: string;
  siteContact: string;
}

interface CylinderModel {
  row: Row & { id: number };
  serial: string;
  branch: BranchModel;
  waterCapacityG: number;
  tareG: number;
  refrigerant: string | null;
  contentsG: number;
}

interface EquipmentModel {
  id: number;
  serial: string;
}

interface Draft {
  seq: number;
  date: string;
  kind: JobKind;
  appliance: ApplianceModel;
  branch: BranchModel;
  tech: TechModel;
  recoverG?: number;
  chargeG?: number;
  cylinder?: CylinderModel;
  equipment?: EquipmentModel;
  evacuation?: { value: number; unit: EvacuationUnit };
  access?: AccessMethod;
  temporaryAccessRemoved?: boolean | null;
  compressorOperating?: boolean | null;
  verificationStage?: "initial" | "follow_up";
  verificationMethod?: string;
  related?: Draft;
  leakLocation?: string;
  repairDescription?: string;
  additionExclusion?: "retrofit" | "installation" | "seasonal";
  notes?: string;
  /** For disposals: which proof to file ("none" = planted gap). */
  disposalProof?: "record" | "statement" | "none";
  disposalPath?: "on_site" | "shop";
  jobId?: number;
}

// ---------------------------------------------------------------------------------------------

export interface DemoData {
  tables: DemoTables;
  /** Facts computed while generating, for the README and tests. */
  facts: { unrecordedShipmentG: number; unrecordedShipmentCylinders: string[] };
}

export function buildDemoData(): DemoData {
  const g = new Generator();
  g.organisation(MAIN_ORG, 20261130);
  g.plantGaps();
  g.organisation(SECOND_ORG, 777);
  g.materialise();
  g.floatingTechnician();
  g.europeanBranch();
  return { tables: g.t, facts: g.facts };
}

class Generator {
  readonly t = new DemoTables();
  readonly facts = { unrecordedShipmentG: 0, unrecordedShipmentCylinders: [] as string[] };
  private readonly passwordHash = bcrypt.hashSync(DEMO_PASSWORD, DEMO_SALT);
  private readonly drafts: Draft[] = [];
  private seq = 0;
  private readonly branches: BranchModel[] = [];
  private readonly byCode = new Map<string, BranchModel>();
  private readonly appliancesByTag = new Map<string, ApplianceModel>();
  private readonly cylindersBySerial = new Map<string, CylinderModel>();
  private readonly equipmentBySerial = new Map<string, EquipmentModel>();
  private readonly techsByKey = new Map<string, TechModel>();
  private readonly usersByKey = new Map<string, number>();
  private readonly stock = new Map<string, number>(); // branchId|refrigerant -> grams of virgin refrigerant on the shelf
  private readonly purchaseRng = new Prng(4242);
  private rng = new Prng(1);

  // -------------------------------------------------------------------------------- people & places

  organisation(spec: OrganisationSpec, seed: number): void {
    this.rng = new Prng(seed);
    const created = stamp(spec.createdOn, 14);
    const org = this.t.add("organisations", {
      name: spec.name,
      rule_packs: JSON.stringify(["us_federal"]),
      settings: JSON.stringify({}),
      created_at: created,
    });

    const branchIds = new Map<string, number>();
    for (const b of spec.branches) {
      const row = this.t.add("branches", {
        organisation_id: org.id,
        name: b.name,
        code: b.code,
        address: b.address,
        time_zone: b.timeZone,
        mass_unit: b.massUnit,
        country: b.country,
        region: b.region,
        created_at: created,
        archived_at: null,
      });
      branchIds.set(b.code, row.id);
    }

    const officerKeys: number[] = [];
    const userIdOf = (key: string) => this.usersByKey.get(`${spec.key}:${key}`)!;
    spec.people.forEach((p, i) => {
      const user = this.t.add("users", {
        organisation_id: org.id,
        email: p.email.toLowerCase(),
        name: p.name,
        password_hash: this.passwordHash,
        active: true,
        created_at: stamp(addDays(spec.createdOn, 2 + i), 15),
        deactivated_at: null,
      });
      this.usersByKey.set(`${spec.key}:${p.key}`, user.id);
      if (p.role === "compliance_officer") officerKeys.push(user.id);
      const branchList = p.branches.length ? p.branches.map((c) => branchIds.get(c)!) : [null];
      for (const branchId of branchList) {
        this.t.add("memberships", {
          organisation_id: org.id,
          user_id: user.id,
          branch_id: branchId,
          role: p.role,
          created_at: stamp(addDays(spec.createdOn, 2 + i), 15),
        });
      }
    });
    const verifier = officerKeys[0] ?? userIdOf("owner");

    // Certifications: card, type(s), verification state.
    for (const p of spec.people) {
      (p.certifications ?? []).forEach((c, n) => {
        const userId = userIdOf(p.key);
        const cert = this.t.add("certifications", {
          organisation_id: org.id,
          user_id: userId,
          certifying_organisation: CERTIFYING_ORGS[(userId + n) % CERTIFYING_ORGS.length],
          certificate_number: `${String.fromCharCode(65 + (userId % 26))}${String(480_000 + userId * 7919 + n * 31).padStart(7, "0")}`,
          issued_on: c.issuedOn,
          card_file_key: `demo/cards/${spec.key}-${p.key}-${n + 1}.jpg`,
          card_mime: "image/jpeg",
          card_thumbnail_key: `demo/cards/${spec.key}-${p.key}-${n + 1}.thumb.jpg`,
          state: c.state,
          verified_by: c.state === "pending" ? null : verifier,
          verified_at: c.state === "pending" ? null : stamp(addDays(c.uploadedOn, 1), 16),
          rejection_reason: c.rejectionReason ?? null,
          uploaded_at: stamp(c.uploadedOn, 13),
          updated_at: stamp(c.state === "pending" ? c.uploadedOn : addDays(c.uploadedOn, 1), 16),
          voided_at: null,
          void_reason: null,
        });
        for (const type of c.types) this.t.push("certification_types", { certification_id: cert.id, organisation_id: org.id, type });
      });
    }

    // Inspector grants (main organisation only).
    if (spec.people.some((p) => p.role === "inspector")) {
      const inspector = userIdOf("inspector");
      const active = this.t.add("inspector_grants", {
        organisation_id: org.id,
        user_id: inspector,
        granted_by: verifier,
        records_from: "2025-01-01",
        records_to: "2025-12-31",
        expires_at: "2027-03-31T23:59:59.000Z",
        revoked_at: null,
        revoked_by: null,
        note: "State review of calendar-year 2025 records, Denver branch",
        created_at: stamp("2026-11-02", 15),
      });
      this.t.push("inspector_grant_branches", { grant_id: active.id, branch_id: branchIds.get("DEN")!, organisation_id: org.id });
      const revoked = this.t.add("inspector_grants", {
        organisation_id: org.id,
        user_id: inspector,
        granted_by: verifier,
        records_from: "2024-12-01",
        records_to: "2025-06-30",
        expires_at: "2026-12-31T23:59:59.000Z",
        revoked_at: stamp("2026-06-01", 18),
        revoked_by: verifier,
        note: "Insurance review, Peoria branch (ended early)",
        created_at: stamp("2026-04-20", 15),
      });
      this.t.push("inspector_grant_branches", { grant_id: revoked.id, branch_id: branchIds.get("PIA")!, organisation_id: org.id });
    }

    // Branch models: people, sites, equipment, cylinders.
    for (const b of spec.branches) {
      const branchId = branchIds.get(b.code)!;
      const techs: TechModel[] = spec.people
        .filter((p) => p.role === "technician" && p.branches.includes(b.code))
        .map((p) => {
          const verified = new Set<CertificationType>();
          for (const c of p.certifications ?? []) if (c.state === "verified") for (const ty of c.types) verified.add(ty);
          const tech: TechModel = {
            id: userIdOf(p.key),
            key: `${spec.key}:${p.key}`,
            name: p.name,
            verifiedTypes: verified,
            plantedOnly: verified.size === 0,
          };
          this.techsByKey.set(tech.key, tech);
          return tech;
        });
      const managerKey = spec.people.find((p) => p.role === "branch_manager" && p.branches.includes(b.code))!.key;
      const model: BranchModel = {
        id: branchId,
        orgId: org.id,
        spec: b,
        managerId: userIdOf(managerKey),
        techs,
        shopSiteId: 0,
        sites: [],
        cylinders: [],
        equipment: { general: [], small: [] },
        reclaimer: RECLAIMERS[b.timeZone === "America/Phoenix" || b.timeZone === "America/Denver" ? 1 : 0]!,
      };
      this.branches.push(model);
      this.byCode.set(b.code, model);
      this.sitesFor(model, spec.createdOn);
      this.equipmentFor(model, spec.createdOn);
      this.cylindersFor(model, spec.createdOn);
      this.appliancesFor(model, spec.createdOn);
    }
  }

  private city(b: BranchSpec): string {
    return b.address.split(",").slice(1).join(",").trim();
  }

  private address(b: BranchSpec): string {
    const rng = this.rng;
    return `${rng.int(100, 9899)} ${rng.pick(STREETS)} ${rng.pick(STREET_KINDS)}, ${this.city(b)}`;
  }

  private sitesFor(b: BranchModel, createdOn: string): void {
    const rng = this.rng;
    const created = stamp(createdOn, 17);
    const shop = this.t.add("sites", {
      organisation_id: b.orgId,
      branch_id: b.id,
      customer_id: null,
      name: `${b.spec.name} shop`,
      address: b.spec.address,
      created_at: created,
      archived_at: null,
    });
    b.shopSiteId = shop.id;
    const kinds: Array<[SiteKind, string[], number]> = [
      ["grocery", ["Fresh Market", "Grocers", "Food Co-op"], 3],
      ["residential", ["Apartments", "Homes Association", "Senior Residences", "Townhomes"], 4],
      ["commercial", ["Medical Offices", "Elementary School", "Business Park", "Public Library", "Hotel", "Distribution Center"], 5],
    ];
    const usedPlaces = new Set<string>();
    for (const [kind, suffixes, count] of kinds) {
      for (let i = 0; i < count; i++) {
        let place = rng.pick(PLACES);
        while (usedPlaces.has(place)) place = rng.pick(PLACES);
        usedPlaces.add(place);
        const name = `${place} ${rng.pick(suffixes)}`;
        const contact = `${rng.pick(["J.", "M.", "R.", "T.", "A.", "L."])} ${rng.pick(["Ferrand", "Osei", "Kowal", "Brightman", "Nakagawa", "Dunmore", "Saltonstall", "Abernethy"])}`;
        const customer = this.t.add("customers", {
          organisation_id: b.orgId,
          branch_id: b.id,
          name,
          contact_name: contact,
          phone: `555-01${String(rng.int(0, 99)).padStart(2, "0")}`,
          email: `facilities@${place.toLowerCase().replace(/[^a-z]/g, "")}.example`,
          address: this.address(b.spec),
          created_at: created,
          archived_at: null,
        });
        const siteCount = kind === "residential" ? rng.int(2, 3) : rng.int(1, 2);
        for (let s = 0; s < siteCount; s++) {
          const address = this.address(b.spec);
          const site = this.t.add("sites", {
            organisation_id: b.orgId,
            branch_id: b.id,
            customer_id: customer.id,
            name: siteCount === 1 ? name : `${name} — ${["North", "South", "East", "West"][s]}`,
            address,
            created_at: created,
            archived_at: null,
          });
          b.sites.push({ id: site.id, kind, address, contact });
        }
      }
    }
  }

  private equipmentFor(b: BranchModel, createdOn: string): void {
    const units = [
      { n: "01", model: "Orvane RX-400 recovery unit", made: "2016-03-14", small: false, dep: false, status: "in_service" },
      { n: "02", model: "Quenby ProRecover 3 recovery unit", made: "2021-08-09", small: false, dep: false, status: "in_service" },
      {
        n: "03",
        model: "Brisewick SA-12 small-appliance recovery unit",
        made: "2019-05-20",
        small: true,
        dep: false,
        status: "in_service",
      },
      { n: "04", model: "Veradyne PassiveDraw recovery bag", made: "2020-11-02", small: true, dep: true, status: "in_service" },
      { n: "05", model: "Orvane RX-200 recovery unit", made: "2009-06-30", small: false, dep: false, status: "retired" },
    ];
    for (const u of units) {
      const serial = `${b.spec.code}-RE-${u.n}`;
      const row = this.t.add("recovery_equipment", {
        organisation_id: b.orgId,
        branch_id: b.id,
        serial,
        make_model: u.model,
        manufactured_on: u.made,
        certification_state: "certified",
        certified_by: EQUIPMENT_TESTER,
        evidence_file_key: `demo/equipment/${serial}.pdf`,
        small_appliance_only: u.small,
        system_dependent: u.dep,
        status: u.status,
        unregistered: false,
        created_at: stamp(createdOn, 18),
        updated_at: stamp(createdOn, 18),
      });
      const model = { id: row.id, serial };
      this.equipmentBySerial.set(serial, model);
      if (u.status !== "in_service") continue;
      if (u.small) b.equipment.small.push(model);
      else b.equipment.general.push(model);
    }
  }

  private cylinder(
    b: BranchModel,
    serial: string,
    wcLb: number,
    tareLb: number,
    requalifiedOn: string,
    createdOn: string,
    pooled: boolean,
  ): CylinderModel {
    const row = this.t.add("cylinders", {
      organisation_id: b.orgId,
      branch_id: b.id,
      serial,
      specification: wcLb <= 50 ? "DOT-4BA400" : "DOT-4BW400",
      purpose: "recovery",
      water_capacity_g: Math.round(wcLb * LB),
      tare_g: Math.round(tareLb * LB),
      manufactured_on: addDays(requalifiedOn, -5 * 365 * this.rng.int(0, 2)),
      last_requalified_on: requalifiedOn,
      refrigerant: null,
      contents_g: 0,
      status: "in_service",
      unregistered: false,
      created_at: stamp(createdOn, 18),
      updated_at: stamp(createdOn, 18),
    });
    const model: CylinderModel = {
      row,
      serial,
      branch: b,
      waterCapacityG: Math.round(wcLb * LB),
      tareG: Math.round(tareLb * LB),
      refrigerant: null,
      contentsG: 0,
    };
    this.cylindersBySerial.set(serial, model);
    if (pooled) b.cylinders.push(model);
    return model;
  }

  private cylindersFor(b: BranchModel, createdOn: string): void {
    const sizes: Array<[number, number]> = [
      [30, 15],
      [50, 17.5],
      [50, 17.5],
      [50, 17.5],
      [123, 48],
      [123, 48],
      [240, 96],
      [240, 96],
    ];
    sizes.forEach(([wc, tare], i) => {
      const requalified = isoOf(this.rng.int(dayOf("2022-01-10"), dayOf("2024-10-30")));
      this.cylinder(b, `${b.spec.code}-C-${String(i + 1).padStart(3, "0")}`, wc, tare, requalified, createdOn, true);
    });
  }

  private appliance(
    b: BranchModel,
    o: {
      tag: string;
      category: string;
      refrigerant: string;
      chargeG: number;
      description: string;
      siteKind?: SiteKind;
      method?: string;
      installedOn?: string;
    },
  ): ApplianceModel {
    const rng = this.rng;
    const candidates = b.sites.filter((s) => !o.siteKind || s.kind === o.siteKind);
    const site = rng.pick(candidates.length ? candidates : b.sites);
    const small = o.category === "small_appliance";
    const brand = rng.pick(BRANDS);
    const installed = o.installedOn ?? isoOf(rng.int(dayOf("2008-01-01"), dayOf("2024-06-30")));
    const row = this.t.add("appliances", {
      organisation_id: b.orgId,
      branch_id: b.id,
      site_id: site.id,
      tag: o.tag,
      description: o.description,
      category: o.category,
      refrigerant: o.refrigerant,
      full_charge_g: o.chargeG,
      full_charge_method: o.method ?? (o.chargeG > 100_000 ? rng.pick(["calculation", "manufacturer_data", "nameplate"]) : "nameplate"),
      make_model: `${brand} ${String.fromCharCode(65 + rng.int(0, 25))}${String.fromCharCode(65 + rng.int(0, 25))}-${rng.int(100, 990)}`,
      serial_number: `${brand.slice(0, 3).toUpperCase()}${rng.int(1_000_000, 9_999_999)}`,
      manufactured_on: addDays(installed, -rng.int(30, 200)),
      factory_sealed: small,
      hermetically_sealed: small,
      has_leak_detection: o.category === "commercial_refrigeration" && o.chargeG > 200_000,
      industrial_shutdown_needed: false,
      awaiting_disposal_at_shop: false,
      status: "in_service",
      installed_on: installed,
      retired_on: null,
      disposed_on: null,
      created_at: stamp("2024-06-20", 12),
      updated_at: stamp("2024-06-20", 12),
    });
    const model: ApplianceModel = {
      row,
      branch: b,
      tag: o.tag,
      category: o.category,
      refrigerant: o.refrigerant,
      chargeG: o.chargeG,
      small,
      lowPressure: LOW_PRESSURE.has(o.refrigerant),
      siteAddress: site.address,
      siteContact: site.contact,
    };
    this.appliancesByTag.set(o.tag, model);
    return model;
  }

  private appliancesFor(b: BranchModel, _createdOn: string): void {
    const rng = this.rng;
    const code = b.spec.code;
    const seqs = new Map<string, number>();
    const tag = (prefix: string) => {
      const n = (seqs.get(prefix) ?? 100) + 1;
      seqs.set(prefix, n);
      return `${code}-${prefix}-${n}`;
    };
    const kg = (min: number, max: number, step = 10) => Math.round(rng.float(min, max) * (1000 / step)) * step;

    for (let i = 0; i < b.spec.counts.sa; i++) {
      const [description, refrigerant, min, max] = rng.weighted<[string, string, number, number]>([
        [["Reach-in beverage cooler", "R-290", 60, 150], 3],
        [["Under-counter freezer", "R-134a", 180, 400], 3],
        [["Ice machine, 300 lb/day", "R-404A", 700, 1400], 2],
        [["Drinking water cooler", "R-134a", 60, 140], 2],
        [["Window air conditioner", "R-32", 400, 750], 2],
        [["Portable dehumidifier", "R-410A", 250, 500], 1],
        [["Household refrigerator", "R-600a", 40, 90], 2],
      ]);
      const a = this.appliance(b, {
        tag: tag("SA"),
        category: "small_appliance",
        refrigerant,
        chargeG: rng.int(min, max),
        description,
        siteKind: rng.pick(["residential", "commercial", "grocery"] as const),
      });
      this.jobsForSmall(a);
    }
    for (let i = 0; i < b.spec.counts.res; i++) {
      const refrigerant = rng.weighted([
        ["R-410A", 50],
        ["R-22", 20],
        ["R-454B", 18],
        ["R-32", 12],
      ] as const);
      const [min, max] = refrigerant === "R-32" ? [1.4, 3.2] : refrigerant === "R-22" ? [2.3, 4.5] : [2.0, 5.0];
      const tons = rng.pick([1.5, 2, 2.5, 3, 3.5, 4, 5]);
      const a = this.appliance(b, {
        tag: tag("RES"),
        category: "residential_split",
        refrigerant,
        chargeG: kg(min, max),
        description: `${tons} ton split ${rng.chance(0.5) ? "heat pump" : "air conditioner"}`,
        siteKind: "residential",
        ...(refrigerant === "R-454B" ? { installedOn: isoOf(rng.int(dayOf("2025-02-01"), dayOf("2026-06-30"))) } : {}),
      });
      this.jobsForResidential(a);
    }
    for (let i = 0; i < b.spec.counts.rtu; i++) {
      const refrigerant = rng.weighted([
        ["R-410A", 55],
        ["R-22", 15],
        ["R-454B", 30],
      ] as const);
      const a = this.appliance(b, {
        tag: tag("RTU"),
        category: "packaged_rooftop",
        refrigerant,
        chargeG: kg(5, 18),
        description: `${rng.pick([5, 7.5, 10, 12.5, 15, 20])} ton packaged rooftop unit`,
        siteKind: "commercial",
      });
      this.jobsForLarge(a, 0.04, true);
    }
    for (let i = 0; i < b.spec.counts.wic; i++) {
      const refrigerant = rng.weighted([
        ["R-404A", 30],
        ["R-448A", 30],
        ["R-449A", 25],
        ["R-134a", 15],
      ] as const);
      const freezer = rng.chance(0.4);
      const a = this.appliance(b, {
        tag: tag("WIC"),
        category: "commercial_refrigeration",
        refrigerant,
        chargeG: kg(4, 12),
        description: freezer ? "Walk-in freezer" : "Walk-in cooler",
        siteKind: rng.chance(0.7) ? "grocery" : "commercial",
      });
      this.jobsForLarge(a, 0.04, false);
    }
    for (let i = 0; i < b.spec.counts.rack; i++) {
      const refrigerant = rng.pick(["R-404A", "R-448A", "R-407A"]);
      const a = this.appliance(b, {
        tag: tag("RACK"),
        category: "commercial_refrigeration",
        refrigerant,
        chargeG: kg(250, 480, 100),
        description: `Supermarket parallel rack, ${rng.chance(0.5) ? "medium" : "low"} temperature`,
        siteKind: "grocery",
        method: "calculation",
      });
      this.jobsForLarge(a, 0.03, false);
    }
    for (const s of b.spec.specials) {
      const a = this.appliance(b, {
        tag: tag(s.prefix),
        category: s.category,
        refrigerant: s.refrigerant,
        chargeG: s.chargeKg * 1000,
        description: s.description,
        siteKind: "commercial",
        method: "manufacturer_data",
      });
      this.jobsForLarge(a, 0.02, false);
    }
  }

  // -------------------------------------------------------------------------------- job drafts

  private readonly H0 = dayOf(DEMO_HISTORY_FROM);
  private readonly H1 = dayOf(DEMO_TODAY) - 2;

  private day(from = this.H0, to = this.H1): string {
    return isoOf(this.rng.int(from, Math.max(from, to)));
  }

  private techFor(a: ApplianceModel): TechModel {
    const able = a.branch.techs.filter((t) => !t.plantedOnly && covers(t, a));
    if (!able.length) throw new Error(`No certified technician for ${a.tag}`);
    return this.rng.pick(able);
  }

  private evacuationFor(a: ApplianceModel): { value: number; unit: EvacuationUnit } {
    const rng = this.rng;
    if (a.small) return { value: rng.int(4, 10), unit: "in_hg_vacuum" };
    if (a.lowPressure) return { value: rng.int(12, 24), unit: "mm_hg_abs" };
    if (rng.chance(0.12)) return { value: rng.int(5, 15) * 100, unit: "microns" };
    return { value: rng.int(16, 27), unit: "in_hg_vacuum" };
  }

  private accessFor(a: ApplianceModel): { access: AccessMethod; removed: boolean | null } {
    const rng = this.rng;
    if (a.small) {
      const access = rng.weighted<AccessMethod>([
        ["piercing_pliers", 4],
        ["bolt_on_line_tap", 2],
        ["quick_connect_fitting", 2],
        ["service_valve", 1],
      ]);
      return { access, removed: access === "piercing_pliers" || access === "bolt_on_line_tap" ? true : null };
    }
    return {
      access: rng.weighted<AccessMethod>([
        ["service_valve", 7],
        ["brazed_access_fitting", 2],
        ["quick_connect_fitting", 1],
      ]),
      removed: null,
    };
  }

  draft(d: Omit<Draft, "seq" | "branch" | "tech"> & { tech?: TechModel }): Draft {
    const full: Draft = { ...d, seq: this.seq++, branch: d.appliance.branch, tech: d.tech ?? this.techFor(d.appliance) };
    this.drafts.push(full);
    return full;
  }

  private recovery(a: ApplianceModel, date: string, grams: number, extra: Partial<Draft> = {}): Draft {
    const { access, removed } = this.accessFor(a);
    return this.draft({
      date,
      kind: "recovery",
      appliance: a,
      recoverG: grams,
      evacuation: this.evacuationFor(a),
      access,
      temporaryAccessRemoved: removed,
      compressorOperating: a.small ? this.rng.chance(0.6) : null,
      ...extra,
    });
  }

  private charge(a: ApplianceModel, date: string, grams: number, extra: Partial<Draft> = {}): Draft {
    return this.draft({ date, kind: "charge", appliance: a, chargeG: grams, access: "service_valve", ...extra });
  }

  private disposal(
    a: ApplianceModel,
    date: string,
    grams: number,
    proof: "record" | "statement" | "none",
    extra: Partial<Draft> = {},
  ): Draft {
    const { access, removed } = this.accessFor(a);
    return this.draft({
      date,
      kind: "disposal",
      appliance: a,
      recoverG: grams,
      evacuation: this.evacuationFor(a),
      access,
      temporaryAccessRemoved: removed,
      compressorOperating: a.small ? this.rng.chance(0.5) : null,
      disposalProof: proof,
      disposalPath: this.rng.chance(0.3) ? "shop" : "on_site",
      ...extra,
    });
  }

  private repairWithVerification(a: ApplianceModel, date: string, tech?: TechModel): void {
    const rng = this.rng;
    const repair = this.draft({
      date,
      kind: "leak_repair",
      appliance: a,
      ...(tech ? { tech } : {}),
      leakLocation: rng.pick([
        "Flare nut at the expansion valve",
        "Schrader core on the suction service port",
        "Rub-through on the liquid line at the condenser",
        "Evaporator return bend",
        "Braze joint at the filter drier",
      ]),
      repairDescription: rng.pick([
        "Tightened and re-sealed the fitting",
        "Replaced the valve core and cap",
        "Cut out and brazed in a new section of line",
        "Replaced the filter drier and re-brazed the joint",
      ]),
    });
    this.draft({
      date,
      kind: "verification_test",
      appliance: a,
      tech: repair.tech,
      verificationStage: "initial",
      verificationMethod: "Standing pressure test with dry nitrogen",
      related: repair,
    });
    const followUp = addDays(date, rng.int(7, 20));
    if (dayOf(followUp) <= this.H1 + 1) {
      this.draft({
        date: followUp,
        kind: "verification_test",
        appliance: a,
        tech: repair.tech,
        verificationStage: "follow_up",
        verificationMethod: "Electronic leak detector sweep at normal operating pressure",
        related: repair,
      });
    }
  }

  private jobsForSmall(a: ApplianceModel): void {
    if (HYDROCARBONS.has(a.refrigerant)) return; // no service history kept for these in the demo
    const rng = this.rng;
    const r = rng.next();
    const share = () => Math.round(a.chargeG * rng.float(0.92, 0.98));
    if (r < 0.22) {
      this.disposal(a, this.day(), share(), "statement");
    } else if (r < 0.65) {
      const d = this.day(this.H0, this.H1 - 1);
      this.recovery(a, d, share(), { notes: "Compressor replaced" });
      this.charge(a, addDays(d, 1), a.chargeG);
    }
  }

  private jobsForResidential(a: ApplianceModel): void {
    const rng = this.rng;
    const installed = String(a.row.installed_on);
    const start = Math.max(this.H0, dayOf(installed));
    if (dayOf(installed) >= this.H0) {
      this.charge(a, installed, a.chargeG, { additionExclusion: "installation", notes: "Charged at installation" });
    }
    const disposalDay = rng.chance(0.1) && start < this.H1 - 60 ? this.day(start + 60, this.H1) : null;
    const last = disposalDay ? dayOf(disposalDay) - 1 : this.H1;
    const topUps = rng.int(2, 8);
    for (let i = 0; i < topUps; i++) {
      this.charge(a, this.day(start + 1, last), Math.round(rng.float(0.15, 0.8) * 100) * 10, {
        notes: rng.pick(["Low on charge after cooling season", "Topped up during maintenance visit", undefined]),
      });
    }
    const overhauls = rng.weighted([
      [0, 45],
      [1, 40],
      [2, 15],
    ] as const);
    for (let i = 0; i < overhauls; i++) {
      const d = this.day(start + 1, last - 1);
      this.recovery(a, d, Math.round(a.chargeG * rng.float(0.94, 0.99)), {
        notes: rng.pick(["Compressor replaced", "Outdoor coil replaced", "Reversing valve replaced", "Indoor coil replaced"]),
      });
      this.charge(a, addDays(d, 1), a.chargeG);
    }
    if (rng.chance(0.3)) {
      const d = this.day(start + 1, last - 25);
      const repair = this.draft({
        date: d,
        kind: "leak_repair",
        appliance: a,
        leakLocation: rng.pick(["Indoor coil", "Outdoor coil", "Line set flare at the air handler", "Service valve stem"]),
        repairDescription: rng.pick([
          "Replaced the indoor coil",
          "Brazed the leak",
          "Replaced the flare fitting",
          "Replaced the valve stem seal",
        ]),
      });
      this.charge(a, d, Math.round(a.chargeG * rng.float(0.2, 0.4)), { tech: repair.tech, notes: "Recharged after leak repair" });
    }
    if (disposalDay) this.disposal(a, disposalDay, Math.round(a.chargeG * rng.float(0.93, 0.99)), "record");
  }

  /** Systems of 15 lb and more: rare, small additions well under every leak-rate threshold, repairs verified. */
  private jobsForLarge(a: ApplianceModel, maxShare: number, mayBeReplaced: boolean): void {
    const rng = this.rng;
    const disposalDay = mayBeReplaced && rng.chance(0.1) ? this.day(this.H0 + 400, this.H1) : null;
    const last = disposalDay ? dayOf(disposalDay) - 1 : this.H1;
    const addition = () => Math.max(150, Math.round((a.chargeG * rng.float(0.01, maxShare)) / 10) * 10);
    const first = this.day(this.H0, Math.min(this.H0 + 330, last));
    const firsts = [first];
    const second = dayOf(first) + rng.int(330, 380);
    if (rng.chance(0.6) && second <= last) firsts.push(isoOf(second));
    for (const d of firsts) {
      const top = this.charge(a, d, addition(), { notes: rng.pick(["Annual maintenance top-up", "Topped up after a low-charge alarm"]) });
      if (rng.chance(0.35)) {
        const repairDay = dayOf(d) + rng.int(2, 12);
        if (repairDay <= last) this.repairWithVerification(a, isoOf(repairDay), top.tech);
      }
    }
    if (disposalDay) {
      this.disposal(a, disposalDay, Math.min(30_000, Math.round(a.chargeG * rng.float(0.93, 0.98))), "record", {
        notes: "Unit replaced; old unit scrapped",
      });
    }
  }

  // -------------------------------------------------------------------------------- planted gaps

  plantGaps(): void {
    this.rng = new Prng(908);
    const b = (code: string) => this.byCode.get(code)!;
    const tech = (key: string) => this.techsByKey.get(`kestrelmoor:${key}`)!;
    const add = (code: string, o: Parameters<Generator["appliance"]>[1]) => this.appliance(b(code), o);
    const created = MAIN_ORG.createdOn;

    // Dedicated cylinders and equipment (kept out of the generated pools).
    const c905 = this.cylinder(b("TUC"), "TUC-C-905", 50, 17.5, "2023-04-11", created, false);
    const c906 = this.cylinder(b("PIA"), "PIA-C-906", 123, 48, "2020-02-18", created, false);
    const c907 = this.cylinder(b("COL"), "COL-C-907", 50, 17.5, "2023-09-01", created, false);
    const c915 = this.cylinder(b("DEN"), "DEN-C-915", 50, 17.5, "2024-02-20", created, false);
    const uncertified = this.t.add("recovery_equipment", {
      organisation_id: b("PIA").orgId,
      branch_id: b("PIA").id,
      serial: "PIA-RE-914",
      make_model: "Callowmark RR-2 recovery unit",
      manufactured_on: "2012-05-17",
      certification_state: "not_certified",
      certified_by: null,
      evidence_file_key: null,
      small_appliance_only: false,
      system_dependent: false,
      status: "in_service",
      unregistered: false,
      created_at: stamp(created, 18),
      updated_at: stamp(created, 18),
    });
    const unregistered = this.t.add("recovery_equipment", {
      organisation_id: b("COL").orgId,
      branch_id: b("COL").id,
      serial: "RE-UNREG-925",
      make_model: "Not in the register: named on a job ticket only",
      manufactured_on: null,
      certification_state: "unknown",
      certified_by: null,
      evidence_file_key: null,
      small_appliance_only: false,
      system_dependent: false,
      status: "in_service",
      unregistered: true,
      created_at: stamp("2025-12-09", 20),
      updated_at: stamp("2025-12-09", 20),
    });
    const eqUncertified = { id: uncertified.id, serial: "PIA-RE-914" };
    const eqUnregistered = { id: unregistered.id, serial: "RE-UNREG-925" };

    // G01 — Type I-only technician recovers from a rooftop unit.
    const rtu901 = add("COL", {
      tag: "COL-RTU-901",
      category: "packaged_rooftop",
      refrigerant: "R-410A",
      chargeG: 9100,
      description: "7.5 ton packaged rooftop unit",
      siteKind: "commercial",
    });
    this.recovery(rtu901, "2025-09-17", 1400, {
      tech: tech("tech-COL-4"),
      notes: "Recovered the condenser section to replace a fan motor bracket",
    });

    // G02 — technician with only a pending card logs a recovery.
    const res902 = add("TUC", {
      tag: "TUC-RES-902",
      category: "residential_split",
      refrigerant: "R-410A",
      chargeG: 3200,
      description: "3 ton split heat pump",
      siteKind: "residential",
    });
    this.recovery(res902, "2026-02-10", 3050, { tech: tech("tech-TUC-4"), notes: "Compressor replaced" });
    this.charge(res902, "2026-02-10", 3200, { tech: tech("tech-TUC-1") });

    // G03 — small appliance disposed of without a disposal statement.
    const sa903 = add("DEN", {
      tag: "DEN-SA-903",
      category: "small_appliance",
      refrigerant: "R-134a",
      chargeG: 240,
      description: "Under-counter freezer",
      siteKind: "commercial",
    });
    this.disposal(sa903, "2026-04-22", 228, "none", { tech: tech("tech-DEN-2"), compressorOperating: true, disposalPath: "shop" });

    // G04 — 5–50 lb appliance disposed of without a disposal record.
    const res904 = add("COL", {
      tag: "COL-RES-904",
      category: "residential_split",
      refrigerant: "R-22",
      chargeG: 3600,
      description: "3 ton split air conditioner",
      siteKind: "residential",
    });
    this.disposal(res904, "2025-07-08", 3450, "none", { tech: tech("tech-COL-2"), disposalPath: "on_site" });

    // G05 — one disposal fills a 50 lb WC cylinder to 97 % of its water capacity.
    const rtu905 = add("TUC", {
      tag: "TUC-RTU-905",
      category: "packaged_rooftop",
      refrigerant: "R-410A",
      chargeG: 22_500,
      description: "20 ton packaged rooftop unit",
      siteKind: "commercial",
    });
    this.disposal(rtu905, "2026-10-14", 21_900, "record", {
      tech: tech("tech-TUC-1"),
      cylinder: c905,
      evacuation: { value: 20, unit: "in_hg_vacuum" },
      access: "service_valve",
      temporaryAccessRemoved: null,
      notes: "Unit replaced; old unit scrapped",
    });

    // G06 — cylinder past its requalification date still in use.
    const res906 = add("PIA", {
      tag: "PIA-RES-906",
      category: "residential_split",
      refrigerant: "R-410A",
      chargeG: 3100,
      description: "2.5 ton split air conditioner",
      siteKind: "residential",
    });
    this.recovery(res906, "2025-09-23", 2950, { tech: tech("tech-PIA-1"), cylinder: c906, notes: "Compressor replaced" });
    this.charge(res906, "2025-09-24", 3100, { tech: tech("tech-PIA-1") });
    this.recovery(res906, "2026-05-12", 3000, { tech: tech("tech-PIA-1"), cylinder: c906, notes: "Indoor coil replaced" });
    this.charge(res906, "2026-05-13", 3100, { tech: tech("tech-PIA-1") });

    // G07 — R-22 recovered into a cylinder already holding R-410A.
    const res907 = add("COL", {
      tag: "COL-RES-907",
      category: "residential_split",
      refrigerant: "R-410A",
      chargeG: 2900,
      description: "2.5 ton split heat pump",
      siteKind: "residential",
    });
    const res957 = add("COL", {
      tag: "COL-RES-957",
      category: "residential_split",
      refrigerant: "R-22",
      chargeG: 3400,
      description: "3 ton split air conditioner",
      siteKind: "residential",
    });
    this.recovery(res907, "2025-11-04", 2750, { tech: tech("tech-COL-1"), cylinder: c907, notes: "Compressor replaced" });
    this.charge(res907, "2025-11-05", 2900, { tech: tech("tech-COL-1") });
    this.recovery(res957, "2025-11-19", 3250, { tech: tech("tech-COL-2"), cylinder: c907, notes: "Outdoor coil replaced" });
    this.charge(res957, "2025-11-20", 3400, { tech: tech("tech-COL-2") });

    // G08 — supermarket rack: 23 % of its charge added, no repair followed.
    const rack908 = add("TUC", {
      tag: "TUC-RACK-908",
      category: "commercial_refrigeration",
      refrigerant: "R-22",
      chargeG: 408_200,
      description: "Supermarket parallel rack, medium temperature (900 lb)",
      siteKind: "grocery",
      method: "calculation",
    });
    this.charge(rack908, "2026-09-12", 95_000, { tech: tech("tech-TUC-1"), notes: "Topped up after low-receiver alarms" });

    // G09 — rack repaired after a 25 % addition, but no verification tests.
    const rack909 = add("DEN", {
      tag: "DEN-RACK-909",
      category: "commercial_refrigeration",
      refrigerant: "R-22",
      chargeG: 235_900,
      description: "Supermarket parallel rack, low temperature (520 lb)",
      siteKind: "grocery",
      method: "calculation",
    });
    const add909 = this.charge(rack909, "2026-06-03", 60_000, { tech: tech("tech-DEN-1"), notes: "Topped up after low-receiver alarms" });
    this.draft({
      date: "2026-06-19",
      kind: "leak_repair",
      appliance: rack909,
      tech: add909.tech,
      leakLocation: "Cracked flare on the liquid line at evaporator 4",
      repairDescription: "Replaced the flare fitting with a brazed joint",
    });

    // G10 — chronic leaker: 130 % of the full charge added during 2025, every leak repaired and verified.
    const rack910 = add("PIA", {
      tag: "PIA-RACK-910",
      category: "commercial_refrigeration",
      refrigerant: "R-22",
      chargeG: 49_900,
      description: "Compact rack, convenience store (110 lb)",
      siteKind: "grocery",
      method: "nameplate",
    });
    for (const d of ["2025-02-11", "2025-04-15", "2025-06-17", "2025-08-19", "2025-10-21"]) {
      const top = this.charge(rack910, d, 12_970, { tech: tech("tech-PIA-2"), notes: "Low charge; leak search started" });
      this.repairWithVerification(rack910, addDays(d, 6), top.tech);
    }

    // G11 — 4 in Hg reached on a 650 lb R-134a (medium-pressure) chiller with post-1993 equipment.
    const ch911 = add("COL", {
      tag: "COL-CH-911",
      category: "chiller",
      refrigerant: "R-134a",
      chargeG: 294_800,
      description: "Centrifugal chiller, convention center (650 lb)",
      siteKind: "commercial",
      method: "manufacturer_data",
    });
    this.recovery(ch911, "2026-08-26", 30_000, {
      tech: tech("tech-COL-1"),
      equipment: this.equipmentBySerial.get("COL-RE-02")!,
      evacuation: { value: 4, unit: "in_hg_vacuum" },
      access: "service_valve",
      notes: "Recovered the isolated condenser bundle for tube cleaning",
    });

    // G12 — a bolt-on line tap left on a small appliance.
    const sa912 = add("TUC", {
      tag: "TUC-SA-912",
      category: "small_appliance",
      refrigerant: "R-134a",
      chargeG: 340,
      description: "Reach-in freezer",
      siteKind: "commercial",
    });
    this.recovery(sa912, "2026-05-06", 325, {
      tech: tech("tech-TUC-3"),
      access: "bolt_on_line_tap",
      temporaryAccessRemoved: false,
      compressorOperating: true,
      evacuation: { value: 6, unit: "in_hg_vacuum" },
      equipment: this.equipmentBySerial.get("TUC-RE-03")!,
      notes: "Start relay and compressor replaced",
    });
    this.charge(sa912, "2026-05-07", 340, { tech: tech("tech-TUC-3") });

    // G13 — small appliance: 57 % recovered with the compressor not running, and no 4 in Hg vacuum.
    const sa913 = add("DEN", {
      tag: "DEN-SA-913",
      category: "small_appliance",
      refrigerant: "R-134a",
      chargeG: 280,
      description: "Under-counter freezer",
      siteKind: "commercial",
    });
    this.recovery(sa913, "2026-07-15", 160, {
      tech: tech("tech-DEN-3"),
      compressorOperating: false,
      evacuation: { value: 0, unit: "in_hg_vacuum" },
      access: "piercing_pliers",
      temporaryAccessRemoved: true,
      equipment: this.equipmentBySerial.get("DEN-RE-03")!,
      notes: "Compressor seized",
    });
    this.charge(sa913, "2026-07-16", 280, { tech: tech("tech-DEN-3") });

    // G14 — recovery with equipment that was never certified.
    const res914 = add("PIA", {
      tag: "PIA-RES-914",
      category: "residential_split",
      refrigerant: "R-410A",
      chargeG: 2800,
      description: "2 ton split heat pump",
      siteKind: "residential",
    });
    this.recovery(res914, "2026-03-03", 2650, { tech: tech("tech-PIA-3"), equipment: eqUncertified, notes: "Compressor replaced" });
    this.charge(res914, "2026-03-04", 2800, { tech: tech("tech-PIA-3") });

    // G15a — a Tucson job recovers into a Denver cylinder.
    const res915 = add("TUC", {
      tag: "TUC-RES-915",
      category: "residential_split",
      refrigerant: "R-410A",
      chargeG: 2700,
      description: "2 ton split air conditioner",
      siteKind: "residential",
    });
    this.recovery(res915, "2026-01-20", 2600, { tech: tech("tech-TUC-1"), cylinder: c915, notes: "Reversing valve replaced" });
    this.charge(res915, "2026-01-21", 2700, { tech: tech("tech-TUC-1") });

    // G15b — recovery equipment missing from the register (a placeholder row flagged unregistered).
    const res925 = add("COL", {
      tag: "COL-RES-925",
      category: "residential_split",
      refrigerant: "R-410A",
      chargeG: 3000,
      description: "2.5 ton split heat pump",
      siteKind: "residential",
    });
    this.recovery(res925, "2025-12-09", 2850, { tech: tech("tech-COL-2"), equipment: eqUnregistered, notes: "Compressor replaced" });
    this.charge(res925, "2025-12-10", 3000, { tech: tech("tech-COL-2") });

    // Not a gap: a CO2 booster rack repaired by the Type I-only technician. Carbon dioxide is an exempt
    // substitute in any application (40 CFR 82.154(a)(1)), so no section 608 finding is raised.
    const co2Rack = add("COL", {
      tag: "COL-RACK-930",
      category: "commercial_refrigeration",
      refrigerant: "R-744",
      chargeG: 180_000,
      description: "Transcritical CO2 booster rack, supermarket",
      siteKind: "grocery",
      method: "manufacturer_data",
      installedOn: "2023-05-15",
    });
    this.draft({
      date: "2026-08-11",
      kind: "leak_repair",
      appliance: co2Rack,
      tech: tech("tech-COL-4"),
      leakLocation: "Gas cooler outlet flare",
      repairDescription: "Replaced the flare gasket and tightened to torque; high-pressure CO2: area ventilated before opening",
    });
  }

  // -------------------------------------------------------------------------------- timeline

  private pickCylinder(b: BranchModel, refrigerant: string, grams: number, date: string): CylinderModel {
    const cap = (c: CylinderModel) => Math.floor(c.waterCapacityG * 0.3);
    const find = () =>
      b.cylinders
        .filter((c) => c.refrigerant === refrigerant && c.contentsG + grams <= cap(c))
        .sort((x, y) => y.contentsG - x.contentsG)[0] ??
      b.cylinders
        .filter((c) => c.contentsG === 0 && cap(c) >= grams)
        .sort((x, y) => x.waterCapacityG - y.waterCapacityG || x.serial.localeCompare(y.serial))[0];
    let found = find();
    if (!found) {
      this.ship(b, date);
      found = find();
    }
    if (!found) throw new Error(`No cylinder can take ${grams} g of ${refrigerant} at ${b.spec.code}`);
    return found;
  }

  private pickEquipment(a: ApplianceModel): EquipmentModel {
    const pool = a.small ? [...a.branch.equipment.small, ...a.branch.equipment.general] : a.branch.equipment.general;
    return this.rng.pick(pool);
  }

  private ship(b: BranchModel, date: string): void {
    const full = b.cylinders.filter((c) => c.contentsG > 0);
    if (!full.length) return;
    const at = stamp(date, 21);
    if (b.spec.code === UNRECORDED_SHIPMENTS.branchCode && UNRECORDED_SHIPMENTS.dates.includes(date)) {
      // Planted gap G16: the cylinders left the shop but nothing was recorded.
      for (const c of full) {
        this.facts.unrecordedShipmentG += c.contentsG;
        if (!this.facts.unrecordedShipmentCylinders.includes(c.serial)) this.facts.unrecordedShipmentCylinders.push(c.serial);
        c.contentsG = 0;
        c.refrigerant = null;
      }
      return;
    }
    const shipment = this.t.add("reclaim_shipments", {
      organisation_id: b.orgId,
      branch_id: b.id,
      shipped_on: date,
      reclaimer_name: b.reclaimer.name,
      reclaimer_address: b.reclaimer.address,
      reference: `BOL-${b.spec.code}-${date.replaceAll("-", "")}`,
      notes: null,
      created_by: b.managerId,
      created_at: at,
      voided_at: null,
      void_reason: null,
    });
    let total = 0;
    for (const c of full) {
      this.t.add("cylinder_weighings", {
        organisation_id: b.orgId,
        branch_id: b.id,
        cylinder_id: c.row.id,
        job_id: null,
        weighed_on: date,
        gross_g: c.tareG + c.contentsG,
        net_g: c.contentsG,
        refrigerant: c.refrigerant,
        pressure_psig: null,
        temperature_c: null,
        weighed_by: b.managerId,
        notes: "Weighed before shipment for reclaim",
        created_at: at,
        voided_at: null,
        void_reason: null,
      });
      this.t.add("reclaim_shipment_lines", {
        organisation_id: b.orgId,
        shipment_id: shipment.id,
        cylinder_id: c.row.id,
        refrigerant: c.refrigerant,
        mass_g: c.contentsG,
      });
      this.t.add("refrigerant_movements", {
        organisation_id: b.orgId,
        branch_id: b.id,
        job_id: null,
        reclaim_shipment_id: shipment.id,
        purchase_id: null,
        cylinder_id: c.row.id,
        direction: "shipped_for_reclaim",
        refrigerant: c.refrigerant,
        mass_g: c.contentsG,
        moved_on: date,
        created_at: at,
        voided_at: null,
      });
      total += c.contentsG;
      c.contentsG = 0;
      c.refrigerant = null;
    }
    this.activity(
      b,
      b.managerId,
      "reclaim_shipment.created",
      "reclaim_shipment",
      shipment.id,
      at,
      `Shipped ${full.length} cylinder${full.length === 1 ? "" : "s"} (${describeMass(total, b.spec.massUnit)}) to ${b.reclaimer.name} for reclaim`,
    );
  }

  private activity(
    b: BranchModel,
    actorId: number | null,
    action: string,
    subjectType: string,
    subjectId: number,
    at: string,
    summary: string,
    data?: unknown,
  ): void {
    this.t.add("activity", {
      organisation_id: b.orgId,
      actor_id: actorId,
      branch_id: b.id,
      action,
      subject_type: subjectType,
      subject_id: subjectId,
      at,
      summary,
      data: data === undefined ? null : JSON.stringify(data),
    });
  }

  materialise(): void {
    const drafts = [...this.drafts].sort((x, y) => (x.date < y.date ? -1 : x.date > y.date ? 1 : x.seq - y.seq));
    let q = 0;
    const quarterCatchUp = (until: string) => {
      while (q < QUARTER_ENDS.length && QUARTER_ENDS[q]! < until) {
        for (const b of this.branches) this.ship(b, QUARTER_ENDS[q]!);
        q++;
      }
    };
    let minute = 0;
    for (const d of drafts) {
      quarterCatchUp(d.date);
      minute = (minute + 7) % 60;
      this.materialiseJob(d, stamp(d.date, 14 + (d.seq % 8), minute));
    }
    quarterCatchUp("9999-12-31");
    for (const c of this.cylindersBySerial.values()) {
      c.row.contents_g = c.contentsG;
      c.row.refrigerant = c.refrigerant;
      c.row.updated_at = stamp(DEMO_TODAY, 6);
    }
  }

  /** Gives the floating technician a second branch (after the history, so nothing else changes). */
  floatingTechnician(): void {
    const userId = this.usersByKey.get(`${MAIN_ORG.key}:${FLOATING_TECHNICIAN.key}`)!;
    const branch = this.byCode.get(FLOATING_TECHNICIAN.alsoIn)!;
    this.t.add("memberships", {
      organisation_id: branch.orgId,
      user_id: userId,
      branch_id: branch.id,
      role: "technician",
      created_at: stamp("2026-02-02", 15),
    });
  }

  /** The main organisation's branch in the EU: its people, a site, appliances and a few charges. */
  europeanBranch(): void {
    this.rng = new Prng(2024573);
    const orgId = this.byCode.get("COL")!.orgId;
    const created = stamp("2025-02-03", 9);
    const row = this.t.add("branches", {
      organisation_id: orgId,
      name: EU_BRANCH.name,
      code: EU_BRANCH.code,
      address: EU_BRANCH.address,
      time_zone: EU_BRANCH.timeZone,
      mass_unit: EU_BRANCH.massUnit,
      country: EU_BRANCH.country,
      region: EU_BRANCH.region,
      created_at: created,
      archived_at: null,
    });
    const person = (p: { key: string; name: string; email: string }, role: "branch_manager" | "technician") => {
      const user = this.t.add("users", {
        organisation_id: orgId,
        email: p.email,
        name: p.name,
        password_hash: this.passwordHash,
        active: true,
        created_at: created,
        deactivated_at: null,
      });
      this.usersByKey.set(`${MAIN_ORG.key}:${p.key}`, user.id);
      this.t.add("memberships", { organisation_id: orgId, user_id: user.id, branch_id: row.id, role, created_at: created });
      return user.id;
    };
    const managerId = person(EU_BRANCH.manager, "branch_manager");
    const techId = person(EU_BRANCH.technician, "technician");
    const tech: TechModel = {
      id: techId,
      key: `${MAIN_ORG.key}:${EU_BRANCH.technician.key}`,
      name: EU_BRANCH.technician.name,
      verifiedTypes: new Set(),
      plantedOnly: false,
    };
    const spec: BranchSpec = {
      code: EU_BRANCH.code,
      name: EU_BRANCH.name,
      address: EU_BRANCH.address,
      timeZone: EU_BRANCH.timeZone,
      massUnit: EU_BRANCH.massUnit,
      country: EU_BRANCH.country,
      region: EU_BRANCH.region,
      counts: { sa: 0, res: 0, rtu: 0, wic: 0, rack: 0 },
      specials: [],
    };
    const model: BranchModel = {
      id: row.id,
      orgId,
      spec,
      managerId,
      techs: [tech],
      shopSiteId: 0,
      sites: [],
      cylinders: [],
      equipment: { general: [], small: [] },
      reclaimer: RECLAIMERS[0]!,
    };
    this.byCode.set(spec.code, model);
    const shop = this.t.add("sites", {
      organisation_id: orgId,
      branch_id: row.id,
      customer_id: null,
      name: `${spec.name} shop`,
      address: spec.address,
      created_at: created,
      archived_at: null,
    });
    model.shopSiteId = shop.id;
    const customer = this.t.add("customers", {
      organisation_id: orgId,
      branch_id: row.id,
      name: "Havenkade Retail Group",
      contact_name: "M. Brouwer",
      phone: "555-0188",
      email: "facilities@havenkade.example",
      address: "Havenkade 5, 3089 Rotterdam, Netherlands",
      created_at: created,
      archived_at: null,
    });
    const site = this.t.add("sites", {
      organisation_id: orgId,
      branch_id: row.id,
      customer_id: customer.id,
      name: "Havenkade Retail Group — Waalhaven",
      address: "Waalhaven Oostzijde 40, 3087 Rotterdam, Netherlands",
      created_at: created,
      archived_at: null,
    });
    model.sites.push({
      id: site.id,
      kind: "commercial",
      address: "Waalhaven Oostzijde 40, 3087 Rotterdam, Netherlands",
      contact: "M. Brouwer",
    });
    const appliances = new Map<string, ApplianceModel>();
    for (const a of EU_BRANCH.appliances) {
      appliances.set(
        a.tag,
        this.appliance(model, {
          tag: a.tag,
          category: a.category,
          refrigerant: a.refrigerant,
          chargeG: a.chargeKg * 1000,
          description: a.description,
          method: "nameplate",
          installedOn: a.installedOn,
        }),
      );
    }
    let minute = 5;
    for (const c of EU_BRANCH.charges) {
      const appliance = appliances.get(c.tag)!;
      const d: Draft = {
        seq: this.seq++,
        date: c.on,
        kind: "charge",
        appliance,
        branch: model,
        tech,
        chargeG: Math.round(c.kg * 1000),
        access: "service_valve",
        notes: "Topped up after a low-charge alarm",
      };
      this.materialiseJob(d, stamp(c.on, 10, (minute += 11)));
    }
  }

  private materialiseJob(d: Draft, at: string): void {
    const a = d.appliance;
    const b = d.branch;
    let cylinder: CylinderModel | undefined;
    let equipment: EquipmentModel | undefined;
    if (d.recoverG) {
      cylinder = d.cylinder ?? this.pickCylinder(b, a.refrigerant, d.recoverG, d.date);
      equipment = d.equipment ?? this.pickEquipment(a);
    }
    const job = this.t.add("jobs", {
      organisation_id: b.orgId,
      branch_id: b.id,
      appliance_id: a.row.id,
      technician_id: d.tech.id,
      kind: d.kind,
      performed_on: d.date,
      refrigerant: a.refrigerant,
      recovered_g: d.recoverG ?? 0,
      charged_g: d.chargeG ?? 0,
      equipment_id: equipment?.id ?? null,
      cylinder_id: cylinder?.row.id ?? null,
      access_method: d.access ?? null,
      temporary_access_removed: d.temporaryAccessRemoved ?? null,
      evacuation_value: d.evacuation?.value ?? null,
      evacuation_unit: d.evacuation?.unit ?? null,
      compressor_operating: d.compressorOperating ?? null,
      verification_stage: d.verificationStage ?? null,
      verification_passed: d.verificationStage ? true : null,
      verification_method: d.verificationMethod ?? null,
      related_job_id: d.related?.jobId ?? null,
      leak_location: d.leakLocation ?? null,
      repair_description: d.repairDescription ?? null,
      addition_exclusion: d.additionExclusion ?? null,
      shutdown_needed: null,
      notes: d.notes ?? null,
      source: "field",
      voided_at: null,
      void_reason: null,
      voided_by: null,
      created_by: d.tech.id,
      created_at: at,
      updated_at: at,
    });
    d.jobId = job.id;
    const mass = (g: number) => describeMass(g, b.spec.massUnit);
    let summary: string;

    if (d.recoverG && cylinder) {
      this.t.add("refrigerant_movements", {
        organisation_id: b.orgId,
        branch_id: b.id,
        job_id: job.id,
        reclaim_shipment_id: null,
        purchase_id: null,
        cylinder_id: cylinder.row.id,
        direction: "recovered_into_cylinder",
        refrigerant: a.refrigerant,
        mass_g: d.recoverG,
        moved_on: d.date,
        created_at: at,
        voided_at: null,
      });
      if (cylinder.contentsG === 0 || cylinder.refrigerant === null) cylinder.refrigerant = a.refrigerant;
      cylinder.contentsG += d.recoverG;
      summary =
        d.kind === "disposal"
          ? `Recovered ${mass(d.recoverG)} ${a.refrigerant} from ${a.tag} for disposal into cylinder ${cylinder.serial}`
          : `Recovered ${mass(d.recoverG)} ${a.refrigerant} from ${a.tag} into cylinder ${cylinder.serial}`;
    } else if (d.chargeG) {
      this.t.add("refrigerant_movements", {
        organisation_id: b.orgId,
        branch_id: b.id,
        job_id: job.id,
        reclaim_shipment_id: null,
        purchase_id: null,
        cylinder_id: null,
        direction: "charged_from_stock",
        refrigerant: a.refrigerant,
        mass_g: d.chargeG,
        moved_on: d.date,
        created_at: at,
        voided_at: null,
      });
      this.takeFromStock(b, a.refrigerant, d.chargeG, d.date);
      summary = `Charged ${mass(d.chargeG)} ${a.refrigerant} into ${a.tag}`;
    } else if (d.kind === "leak_repair") {
      summary = `Repaired a leak on ${a.tag}: ${d.leakLocation ?? "location not given"}`;
    } else {
      summary = `${d.verificationStage === "follow_up" ? "Follow-up" : "Initial"} verification test passed on ${a.tag}`;
    }
    this.activity(b, d.tech.id, `job.${d.kind}.created`, "job", job.id, at, summary);

    if (d.kind === "disposal") {
      a.row.status = "disposed";
      a.row.disposed_on = d.date;
      a.row.retired_on = d.date;
      a.row.updated_at = at;
      if (d.disposalPath === "shop") a.row.site_id = b.shopSiteId;
      if (d.disposalProof === "statement") {
        this.t.add("disposal_statements", {
          organisation_id: b.orgId,
          branch_id: b.id,
          appliance_id: a.row.id,
          job_id: job.id,
          recovered_by_name: d.tech.name,
          recovered_by_address: b.spec.address,
          recovered_on: d.date,
          signed_by_name: d.tech.name,
          signed_on: d.date,
          document_file_key: `demo/disposal-statements/${a.tag}.pdf`,
          document_mime: "application/pdf",
          created_by: d.tech.id,
          created_at: at,
          updated_at: at,
          voided_at: null,
          void_reason: null,
        });
      } else if (d.disposalProof === "record") {
        this.t.add("disposal_records", {
          organisation_id: b.orgId,
          branch_id: b.id,
          appliance_id: a.row.id,
          job_id: job.id,
          disposed_on: d.date,
          disposal_path: d.disposalPath ?? "on_site",
          appliance_location: d.disposalPath === "shop" ? b.spec.address : a.siteAddress,
          recovered_on: d.date,
          recovered_by_user_id: d.tech.id,
          recovered_by_name: d.tech.name,
          refrigerant: a.refrigerant,
          recovered_g: d.recoverG ?? 0,
          sent_to: SCRAP_YARD,
          created_by: d.tech.id,
          created_at: at,
          updated_at: at,
          voided_at: null,
          void_reason: null,
        });
      }
    }
  }

  /** Virgin refrigerant is bought in 25 lb jugs when the shelf runs short, the day it is needed. */
  private takeFromStock(b: BranchModel, refrigerant: string, grams: number, date: string): void {
    const JUG_G = Math.round(25 * LB);
    const key = `${b.id}|${refrigerant}`;
    const onShelf = this.stock.get(key) ?? 0;
    if (onShelf < grams) {
      const jugs = Math.ceil((grams - onShelf) / JUG_G) + (this.purchaseRng.chance(0.3) ? 1 : 0);
      const at = stamp(date, 12);
      const massG = jugs * JUG_G;
      const supplier = SUPPLIERS[b.id % SUPPLIERS.length]!;
      const purchase = this.t.add("purchases", {
        organisation_id: b.orgId,
        branch_id: b.id,
        purchased_on: date,
        supplier_name: supplier,
        refrigerant,
        mass_g: massG,
        container_count: jugs,
        invoice_reference: `INV-${b.spec.code}-${date.replaceAll("-", "")}-${refrigerant.replace(/[^A-Za-z0-9]/g, "")}`,
        created_by: b.managerId,
        created_at: at,
        voided_at: null,
        void_reason: null,
      });
      this.t.add("refrigerant_movements", {
        organisation_id: b.orgId,
        branch_id: b.id,
        job_id: null,
        reclaim_shipment_id: null,
        purchase_id: purchase.id,
        cylinder_id: null,
        direction: "purchased",
        refrigerant,
        mass_g: massG,
        moved_on: date,
        created_at: at,
        voided_at: null,
      });
      this.activity(
        b,
        b.managerId,
        "purchase.created",
        "purchase",
        purchase.id,
        at,
        `Bought ${describeMass(massG, b.spec.massUnit)} ${refrigerant} (${jugs} × 25 lb) from ${supplier}`,
      );
      this.stock.set(key, onShelf + massG);
    }
    this.stock.set(key, (this.stock.get(key) ?? 0) - grams);
  }
}

function covers(t: TechModel, a: ApplianceModel): boolean {
  if (t.verifiedTypes.has("universal")) return true;
  if (a.small) return t.verifiedTypes.has("type_i");
  if (a.lowPressure) return t.verifiedTypes.has("type_iii");
  return t.verifiedTypes.has("type_ii");
}
