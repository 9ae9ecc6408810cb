/**
 * The demo scenario: an invented contracting company and a second, small invented company.
 * Every name, address and model here is made up; e-mail domains are under `.example` (RFC 2606).
 */
import type { CertificationType, MassDisplayUnit, Role } from "@coldtrail/core";

/** Every demo user signs in with this password. For local demos only. */
export const DEMO_PASSWORD = "coldtrail-demo";

/** "Today" for the generated history; the demo data is the same whatever the real date. */
export const DEMO_TODAY = "2026-11-30";
export const DEMO_HISTORY_FROM = "2024-12-01";

export interface BranchSpec {
  code: string;
  name: string;
  address: string;
  timeZone: string;
  massUnit: MassDisplayUnit;
  /** ISO 3166-1 alpha-2 country and state/region: the rule packs that apply follow from them. */
  country: string;
  region: string | null;
  /** How many appliances of each generated kind the branch serves. */
  counts: { sa: number; res: number; rtu: number; wic: number; rack: number };
  /** Large one-off systems: chillers and industrial process refrigeration. */
  specials: ReadonlyArray<{ prefix: string; category: string; refrigerant: string; chargeKg: number; description: string }>;
}

export interface PersonSpec {
  key: string;
  name: string;
  email: string;
  role: Role;
  /** Branch codes; none for organisation-wide roles. */
  branches: string[];
  certifications?: ReadonlyArray<{
    types: CertificationType[];
    state: "verified" | "pending" | "rejected";
    issuedOn: string;
    uploadedOn: string;
    rejectionReason?: string;
  }>;
}

export interface OrganisationSpec {
  key: string;
  name: string;
  domain: string;
  createdOn: string;
  branches: BranchSpec[];
  people: PersonSpec[];
}

const UNIVERSAL_OK: PersonSpec["certifications"] = [
  { types: ["universal"], state: "verified", issuedOn: "2016-04-12", uploadedOn: "2024-06-03" },
];

function tech(key: string, name: string, domain: string, branch: string, certs: PersonSpec["certifications"] = UNIVERSAL_OK): PersonSpec {
  return { key, name, email: emailOf(name, domain), role: "technician", branches: [branch], certifications: certs };
}

export function emailOf(name: string, domain: string): string {
  const parts = name
    .toLowerCase()
    .normalize("NFD")
    .replace(/[\u0300-\u036f]/g, "")
    .split(/\s+/);
  const first = parts[0] ?? "user";
  const last = (parts[parts.length - 1] ?? "").replace(/[^a-z-]/g, "");
  return `${first}.${last}@${domain}`;
}

const KM = "kestrelmoor.example";

export const MAIN_ORG: OrganisationSpec = {
  key: "kestrelmoor",
  name: "Kestrelmoor Climate Services",
  domain: KM,
  createdOn: "2024-06-01",
  branches: [
    {
      code: "COL",
      name: "Columbus",
      address: "2150 Tinplate Way, Columbus, OH 43219",
      timeZone: "America/New_York",
      massUnit: "lb_oz",
      country: "US",
      region: "OH",
      counts: { sa: 16, res: 50, rtu: 14, wic: 8, rack: 2 },
      specials: [
        { prefix: "CH", category: "chiller", refrigerant: "R-134a", chargeKg: 410, description: "Centrifugal chiller, office tower" },
        {
          prefix: "CH",
          category: "chiller",
          refrigerant: "R-123",
          chargeKg: 450,
          description: "Low-pressure centrifugal chiller, hospital plant",
        },
      ],
    },
    {
      code: "TUC",
      name: "Tucson",
      address: "880 W Saguaro Mill Rd, Tucson, AZ 85705",
      timeZone: "America/Phoenix",
      massUnit: "lb_oz",
      country: "US",
      region: "AZ",
      counts: { sa: 16, res: 52, rtu: 16, wic: 7, rack: 2 },
      specials: [
        {
          prefix: "CH",
          category: "chiller",
          refrigerant: "R-1233zd(E)",
          chargeKg: 380,
          description: "Low-pressure chiller, university library",
        },
      ],
    },
    {
      code: "DEN",
      name: "Denver",
      address: "4410 Larkfield St, Denver, CO 80216",
      timeZone: "America/Denver",
      massUnit: "kg",
      country: "US",
      region: "CO",
      counts: { sa: 16, res: 48, rtu: 14, wic: 8, rack: 2 },
      specials: [
        {
          prefix: "IPR",
          category: "industrial_process",
          refrigerant: "R-507A",
          chargeKg: 640,
          description: "Blast freezer plant, food processor",
        },
      ],
    },
    {
      code: "PIA",
      name: "Peoria",
      address: "317 Foundry Hollow Dr, Peoria, IL 61602",
      timeZone: "America/Chicago",
      massUnit: "lb_oz",
      country: "US",
      region: "IL",
      counts: { sa: 16, res: 48, rtu: 14, wic: 8, rack: 2 },
      specials: [
        { prefix: "CH", category: "chiller", refrigerant: "R-134a", chargeKg: 330, description: "Screw chiller, county courthouse" },
        {
          prefix: "IPR",
          category: "industrial_process",
          refrigerant: "R-134a",
          chargeKg: 520,
          description: "Process cooling loop, plastics moulding plant",
        },
      ],
    },
  ],
  people: [
    { key: "owner", name: "Marguerite Halvorsen", email: `marguerite.halvorsen@${KM}`, role: "owner", branches: [] },
    { key: "officer", name: "Teodora Vasquez-Lind", email: `teodora.vasquez-lind@${KM}`, role: "compliance_officer", branches: [] },
    { key: "officer2", name: "Anand Krishnaswamy", email: `anand.krishnaswamy@${KM}`, role: "compliance_officer", branches: [] },
    { key: "mgr-COL", name: "Grant Oyelaran", email: `grant.oyelaran@${KM}`, role: "branch_manager", branches: ["COL"] },
    { key: "mgr-TUC", name: "Lucia Baptiste-Moreno", email: `lucia.baptiste-moreno@${KM}`, role: "branch_manager", branches: ["TUC"] },
    { key: "mgr-DEN", name: "Henrik Solvang", email: `henrik.solvang@${KM}`, role: "branch_manager", branches: ["DEN"] },
    { key: "mgr-PIA", name: "Danielle Achterberg", email: `danielle.achterberg@${KM}`, role: "branch_manager", branches: ["PIA"] },
    tech("tech-COL-1", "Marcus Delacroix-Byrd", KM, "COL"),
    tech("tech-COL-2", "Yusuf Okonkwo-Hale", KM, "COL"),
    tech("tech-COL-3", "Bethany Trask", KM, "COL", [
      { types: ["type_i", "type_ii"], state: "verified", issuedOn: "2019-08-21", uploadedOn: "2024-06-04" },
    ]),
    // Planted: holds Type I only, yet works on a rooftop unit (see README, gap G01).
    tech("tech-COL-4", "Caleb Runyon", KM, "COL", [
      { types: ["type_i"], state: "verified", issuedOn: "2023-02-14", uploadedOn: "2024-06-05" },
    ]),
    tech("tech-TUC-1", "Rafael Ibarra-Quint", KM, "TUC"),
    tech("tech-TUC-2", "Tomasz Wierzbicki", KM, "TUC", [
      { types: ["type_ii", "type_iii"], state: "verified", issuedOn: "2014-10-02", uploadedOn: "2024-06-03" },
    ]),
    tech("tech-TUC-3", "Shawna Pellerin", KM, "TUC"),
    // Planted: only a pending card, yet logs a job (G02).
    tech("tech-TUC-4", "Diego Castellanos-Reyes", KM, "TUC", [
      { types: ["universal"], state: "pending", issuedOn: "2025-12-18", uploadedOn: "2026-01-05" },
    ]),
    tech("tech-DEN-1", "Kai Lindqvist", KM, "DEN", [
      {
        types: ["universal"],
        state: "rejected",
        issuedOn: "2015-03-09",
        uploadedOn: "2024-06-03",
        rejectionReason: "The photo is too blurred to read the certificate number.",
      },
      { types: ["universal"], state: "verified", issuedOn: "2015-03-09", uploadedOn: "2024-06-10" },
    ]),
    tech("tech-DEN-2", "Meredith Obuya", KM, "DEN"),
    tech("tech-DEN-3", "Nils Haraldsen", KM, "DEN"),
    tech("tech-DEN-4", "Jolene Fairweather", KM, "DEN", [
      { types: ["type_i", "type_ii"], state: "verified", issuedOn: "2020-05-30", uploadedOn: "2024-06-06" },
    ]),
    tech("tech-PIA-1", "Trevor Amadi", KM, "PIA"),
    tech("tech-PIA-2", "Corinne Vashti", KM, "PIA"),
    tech("tech-PIA-3", "Silas Wetherby", KM, "PIA"),
    tech("tech-PIA-4", "Ingrid Castellane", KM, "PIA", [
      { types: ["type_i", "type_ii", "type_iii"], state: "verified", issuedOn: "2018-01-22", uploadedOn: "2024-06-07" },
    ]),
    tech("tech-PIA-5", "Oren Castillo-Vance", KM, "PIA"),
    // External reviewer: read-only, one branch, a date window, an expiry.
    { key: "inspector", name: "Harold Penwick", email: "harold.penwick@statewide-review.example", role: "inspector", branches: [] },
  ],
};

const QF = "quillfield-refrigeration.example";

export const SECOND_ORG: OrganisationSpec = {
  key: "quillfield",
  name: "Quillfield Refrigeration",
  domain: QF,
  createdOn: "2024-09-02",
  branches: [
    {
      code: "BOI",
      name: "Boise",
      address: "95 Sagebrush Ct, Boise, ID 83702",
      timeZone: "America/Boise",
      massUnit: "lb_oz",
      country: "US",
      region: "ID",
      counts: { sa: 2, res: 6, rtu: 2, wic: 1, rack: 0 },
      specials: [],
    },
  ],
  people: [
    { key: "owner", name: "Beatrix Holloway", email: `beatrix.holloway@${QF}`, role: "owner", branches: [] },
    { key: "mgr-BOI", name: "Wendell Ashgrove", email: `wendell.ashgrove@${QF}`, role: "branch_manager", branches: ["BOI"] },
    tech("tech-BOI-1", "Paloma Quintero-Dahl", QF, "BOI"),
  ],
};

/**
 * The company's branch in the European Union, added after the US history is generated: a few
 * appliances with fluorinated gases and their jobs, so the EU rules have something to say. US rules
 * never apply to it, and EU rules never apply to the US branches.
 */
export const EU_BRANCH = {
  code: "RTM",
  name: "Rotterdam",
  address: "Koelvakweg 27, 3089 KN Rotterdam, Netherlands",
  timeZone: "Europe/Amsterdam",
  massUnit: "kg" as MassDisplayUnit,
  country: "NL",
  region: "South Holland",
  manager: { key: "mgr-RTM", name: "Femke Oudendijk", email: `femke.oudendijk@${KM}` },
  technician: { key: "tech-RTM-1", name: "Joost van Lieshout", email: `joost.vanlieshout@${KM}` },
  appliances: [
    // 45 kg R-404A ≈ 176 t CO2e: leak checks every 6 months; none on record.
    {
      tag: "RTM-RACK-101",
      category: "commercial_refrigeration",
      refrigerant: "R-404A",
      chargeKg: 45,
      installedOn: "2019-04-08",
      description: "Supermarket rack, chilled aisles",
    },
    // 380 kg R-134a ≈ 543 t CO2e: a leak-detection system is required and none is recorded.
    {
      tag: "RTM-CH-101",
      category: "chiller",
      refrigerant: "R-134a",
      chargeKg: 380,
      installedOn: "2017-09-19",
      description: "Screw chiller, port office building",
    },
    // 12 kg R-410A ≈ 25 t CO2e: a check every 12 months.
    {
      tag: "RTM-RTU-101",
      category: "packaged_rooftop",
      refrigerant: "R-410A",
      chargeKg: 12,
      installedOn: "2021-06-02",
      description: "Rooftop unit, furniture showroom",
    },
  ],
  /** Charges logged at the branch (date, tag, kg). */
  charges: [
    { on: "2026-03-17", tag: "RTM-RACK-101", kg: 3.5 },
    { on: "2026-08-04", tag: "RTM-RTU-101", kg: 0.8 },
  ],
} as const;

/**
 * A technician who works in two branches (normal in the trade): Diego Castellanos-Reyes of Tucson
 * also covers Peoria. His card is awaiting verification, a finding about him, not about a branch:
 * it is one finding, shown in both branches.
 */
export const FLOATING_TECHNICIAN = { key: "tech-TUC-4", alsoIn: "PIA" } as const;

/** One sign-in per role, for the README, demos and end-to-end tests. */
export const DEMO_SIGN_INS: Record<Role | "other_org_manager" | "other_org_technician", string> = {
  owner: `marguerite.halvorsen@${KM}`,
  compliance_officer: `teodora.vasquez-lind@${KM}`,
  branch_manager: `grant.oyelaran@${KM}`,
  technician: `marcus.delacroix-byrd@${KM}`,
  inspector: "harold.penwick@statewide-review.example",
  other_org_manager: `wendell.ashgrove@${QF}`,
  other_org_technician: `paloma.quintero-dahl@${QF}`,
};
