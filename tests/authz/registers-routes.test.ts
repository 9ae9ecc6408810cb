import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { createRequire } from "node:module";
import { realpathSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { defineAbilityFor, type Actor, type AppAbility } from "@coldtrail/core";
import { DEMO_SIGN_INS, loadActor } from "@coldtrail/db";
import { createSeededTestDb, type TestDb } from "@coldtrail/db/testing";
import { cardPng } from "../fixtures/card-files";

/**
 * The registers' API routes, called as the server calls them (the real `route()` wrapper, the real
 * handlers, a copy of the demo database), for each role × a record of their own branch, of another
 * branch and of another organisation. Only the session lookup and the object store are replaced.
 */

const web = (p: string) => fileURLToPath(new URL(`../../apps/web/src/${p}`, import.meta.url));
const webRequire = createRequire(new URL("../../apps/web/package.json", import.meta.url));
const { NextRequest } = webRequire("next/server") as { NextRequest: new (url: string, init?: RequestInit) => Request };

type Handler = (req: Request, ctx: { params: Promise<Record<string, string>> }) => Promise<Response>;
type RouteModule = Record<"GET" | "POST" | "PATCH", Handler | undefined>;

let t: TestDb;
const session: { signedIn: { actor: Actor; ability: AppAbility } | null } = { signedIn: null };
const stored = new Map<string, { bytes: Uint8Array; mime: string }>();
const routes = {} as Record<string, RouteModule>;

const ROLES = ["owner", "compliance_officer", "branch_manager", "technician", "inspector", "other_org_manager"] as const;
type RoleKey = (typeof ROLES)[number];
type Place = "own" | "other" | "otherOrg";
const actors = {} as Record<RoleKey, Actor>;
const branch = { own: 0, other: 0, otherOrg: 0 };
const records = {} as Record<"appliance" | "cylinder" | "equipment", Record<Place, number>>;

async function signInAs(role: RoleKey | null) {
  if (role === null) {
    session.signedIn = null;
    return;
  }
  const actor = actors[role];
  session.signedIn = { actor, ability: defineAbilityFor(actor, new Date("2026-12-01T12:00:00Z")) };
}

async function call(
  route: string,
  method: "GET" | "POST" | "PATCH",
  opts: { query?: string; params?: Record<string, string>; body?: unknown; form?: FormData } = {},
) {
  const handler = routes[route]?.[method];
  if (!handler) throw new Error(`${method} ${route} is not exported`);
  // Writes come from the app's own pages: the browser sends the app's origin.
  const init: RequestInit = { method, headers: { origin: "http://127.0.0.1:3000" } };
  if (opts.body !== undefined) {
    init.body = JSON.stringify(opts.body);
    init.headers = { origin: "http://127.0.0.1:3000", "content-type": "application/json" };
  }
  if (opts.form) init.body = opts.form;
  const res = await handler(new NextRequest(`http://localhost/api/x${opts.query ? `?${opts.query}` : ""}`, init), {
    params: Promise.resolve(opts.params ?? {}),
  });
  const text = await res.text();
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch {
    json = text;
  }
  return { status: res.status, json: json as Record<string, unknown> };
}

const count = async (table: string) => Number((await t.db(table).count({ n: "*" }).first())!.n);
let serialNo = 0;
const unique = (prefix: string) => `${prefix}-${++serialNo}`;

beforeAll(async () => {
  t = await createSeededTestDb();
  vi.doMock(realpathSync(webRequire.resolve("server-only")), () => ({}));
  vi.doMock(web("lib/auth/current-actor.ts"), () => ({ currentActor: async () => session.signedIn }));
  vi.doMock(web("lib/db.ts"), () => ({ db: () => t.db }));
  vi.doMock("@/lib/api/route", () => import(web("lib/api/route.ts")));
  vi.doMock("@/lib/server/storage", () => {
    // Object storage in memory; the upload checks (lib/server/uploads) are the real ones.
    return {
      putFile: async (o: { prefix: string; bytes: Uint8Array; mime: string; ext: string }) => {
        const key = `${o.prefix}/${stored.size + 1}.${o.ext}`;
        stored.set(key, { bytes: o.bytes, mime: o.mime });
        return key;
      },
      getFile: async (key: string) => {
        const f = stored.get(key);
        if (!f) throw Object.assign(new Error("NoSuchKey"), { name: "NoSuchKey", $metadata: { httpStatusCode: 404 } });
        return f;
      },
    };
  });
  const load = (p: string) => import(web(`app/api/${p}/route.ts`)) as Promise<RouteModule>;
  for (const p of [
    "appliances",
    "appliances/[id]",
    "appliances/[id]/status",
    "appliances/[id]/history",
    "appliances/sites",
    "appliances/customers",
    "equipment",
    "equipment/[id]",
    "equipment/[id]/evidence",
    "cylinders",
    "cylinders/[id]",
    "cylinders/[id]/weighings",
    "cylinders/[id]/weighings/[weighingId]",
    "cylinders/[id]/weighings/[weighingId]/void",
    "cylinders/[id]/movements",
  ]) {
    routes[p] = await load(p);
  }

  for (const role of ROLES) {
    const user = await t.db("users").where({ email: DEMO_SIGN_INS[role] }).first("id");
    actors[role] = (await loadActor(t.db, Number(user.id)))!;
  }
  const id = async (table: string, where: Record<string, unknown>) => Number((await t.db(table).where(where).orderBy("id").first("id")).id);
  branch.own = await id("branches", { code: "COL" }); // the manager's and the technician's branch
  branch.other = await id("branches", { code: "DEN" }); // the inspector's granted branch
  branch.otherOrg = await id("branches", { code: "BOI" });
  for (const [kind, table] of [
    ["appliance", "appliances"],
    ["cylinder", "cylinders"],
    ["equipment", "recovery_equipment"],
  ] as const) {
    records[kind] = {
      own: await id(table, { branch_id: branch.own, status: "in_service", ...(kind === "appliance" ? {} : { unregistered: false }) }),
      other: await id(table, { branch_id: branch.other, status: "in_service", ...(kind === "appliance" ? {} : { unregistered: false }) }),
      otherOrg: await id(table, { branch_id: branch.otherOrg, status: "in_service" }),
    };
  }
}, 120_000);

afterAll(async () => {
  vi.resetModules();
  await t?.destroy();
});

/** Expected status of reading a record, by role and where the record is. */
const READ: Record<RoleKey, Record<Place, number>> = {
  owner: { own: 200, other: 200, otherOrg: 404 },
  compliance_officer: { own: 200, other: 200, otherOrg: 404 },
  branch_manager: { own: 200, other: 404, otherOrg: 404 },
  technician: { own: 200, other: 404, otherOrg: 404 },
  inspector: { own: 404, other: 200, otherOrg: 404 },
  other_org_manager: { own: 404, other: 404, otherOrg: 200 },
};
/**
 * Changing a record: a role without the permission anywhere is refused at the door (403, whatever the
 * record); one that has it elsewhere gets 404 for a record it cannot even read.
 */
const WRITE: Record<RoleKey, Record<Place, number>> = {
  owner: { own: 200, other: 200, otherOrg: 404 },
  compliance_officer: { own: 403, other: 403, otherOrg: 403 },
  branch_manager: { own: 200, other: 404, otherOrg: 404 },
  technician: { own: 403, other: 403, otherOrg: 403 },
  inspector: { own: 403, other: 403, otherOrg: 403 },
  other_org_manager: { own: 404, other: 404, otherOrg: 200 },
};
/** Adding a record to a branch (404: a branch of another organisation is not found for the owner). */
const CREATE: Record<RoleKey, Record<Place, number>> = {
  owner: { own: 201, other: 201, otherOrg: 404 },
  compliance_officer: { own: 403, other: 403, otherOrg: 403 },
  branch_manager: { own: 201, other: 403, otherOrg: 403 },
  technician: { own: 403, other: 403, otherOrg: 403 },
  inspector: { own: 403, other: 403, otherOrg: 403 },
  other_org_manager: { own: 403, other: 403, otherOrg: 201 },
};
const PLACES: Place[] = ["own", "other", "otherOrg"];

async function appliancePatchBody(id: number, note: string) {
  const a = await t.db("appliances").where({ id }).first();
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
    makeModel: note,
    manufacturedOn: a.manufactured_on ?? undefined,
    installedOn: a.installed_on ?? undefined,
  };
}
async function cylinderPatchBody(id: number, note: string) {
  const c = await t.db("cylinders").where({ id }).first();
  return {
    serial: c.serial,
    specification: note,
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
async function equipmentPatchBody(id: number, note: string) {
  const e = await t.db("recovery_equipment").where({ id }).first();
  return {
    serial: e.serial,
    makeModel: note,
    manufacturedOn: e.manufactured_on ?? undefined,
    certificationState: e.certification_state,
    certifiedBy: e.certified_by ?? undefined,
    smallApplianceOnly: Boolean(e.small_appliance_only),
    systemDependent: Boolean(e.system_dependent),
    status: e.status,
  };
}

describe("nobody signed in", () => {
  it("every register route answers 401 and writes nothing", async () => {
    await signInAs(null);
    const before = await count("activity");
    const p = { id: String(records.appliance.own), weighingId: "1" };
    for (const [route, methods] of Object.entries(routes)) {
      for (const method of ["GET", "POST", "PATCH"] as const) {
        if (!methods[method]) continue;
        const res = await call(route, method, { params: p, body: method === "GET" ? undefined : {}, query: "branchId=1" });
        expect(res.status, `${method} ${route}`).toBe(401);
      }
    }
    expect(await count("activity")).toBe(before);
  });
});

describe.each(ROLES)("%s", (role) => {
  it("reads a record only where allowed, and lists no row it may not read", async () => {
    await signInAs(role);
    const { organisationId } = actors[role];
    for (const kind of ["appliance", "cylinder", "equipment"] as const) {
      const route = kind === "appliance" ? "appliances" : kind === "cylinder" ? "cylinders" : "equipment";
      for (const place of PLACES) {
        const res = await call(`${route}/[id]`, "GET", { params: { id: String(records[kind][place]) } });
        expect(res.status, `${role} reads ${kind} (${place})`).toBe(READ[role][place]);
      }
      const list = await call(route, "GET", { query: "pageSize=200" });
      expect(list.status).toBe(200);
      const rows = list.json.rows as Array<{ organisationId: number; branchId: number }>;
      const readableBranches = PLACES.filter((p) => READ[role][p] === 200).map((p) => branch[p]);
      expect(rows.length, `${role} lists some ${kind}s`).toBeGreaterThan(0);
      for (const r of rows) {
        expect(r.organisationId).toBe(organisationId);
        if (role !== "owner" && role !== "compliance_officer") expect(readableBranches).toContain(r.branchId);
      }
      // Filtering on a branch the person may not read gives nothing, not an error that reveals it.
      for (const place of PLACES.filter((p) => READ[role][p] !== 200)) {
        const filtered = await call(route, "GET", { query: `branchId=${branch[place]}` });
        expect(filtered.status).toBe(200);
        expect(filtered.json.total, `${role} filters ${kind}s on a ${place} branch`).toBe(0);
      }
    }
    for (const place of PLACES) {
      const history = await call("appliances/[id]/history", "GET", { params: { id: String(records.appliance[place]) } });
      expect(history.status, `${role} history (${place})`).toBe(READ[role][place]);
      const weighings = await call("cylinders/[id]/weighings", "GET", { params: { id: String(records.cylinder[place]) } });
      expect(weighings.status, `${role} weighings (${place})`).toBe(READ[role][place]);
      const movements = await call("cylinders/[id]/movements", "GET", { params: { id: String(records.cylinder[place]) } });
      expect(movements.status, `${role} movements (${place})`).toBe(READ[role][place]);
      const sites = await call("appliances/sites", "GET", { query: `branchId=${branch[place]}` });
      if (sites.status === 200) {
        const readsSites = READ[role][place] === 200;
        expect((sites.json.rows as unknown[]).length > 0, `${role} sites (${place})`).toBe(readsSites);
      }
    }
  });

  it("changes a record only where allowed; refused changes write nothing", async () => {
    await signInAs(role);
    for (const place of PLACES) {
      const expected = WRITE[role][place];
      const before = {
        activity: await count("activity"),
        amendments: await count("amendments"),
        weighings: await count("cylinder_weighings"),
      };
      const note = `Checked by ${role} ${place} ${++serialNo}`;
      const a = await call("appliances/[id]", "PATCH", {
        params: { id: String(records.appliance[place]) },
        body: await appliancePatchBody(records.appliance[place], note),
      });
      expect(a.status, `${role} edits appliance (${place})`).toBe(expected);
      const c = await call("cylinders/[id]", "PATCH", {
        params: { id: String(records.cylinder[place]) },
        body: await cylinderPatchBody(records.cylinder[place], note),
      });
      expect(c.status, `${role} edits cylinder (${place})`).toBe(expected);
      const e = await call("equipment/[id]", "PATCH", {
        params: { id: String(records.equipment[place]) },
        body: await equipmentPatchBody(records.equipment[place], note),
      });
      expect(e.status, `${role} edits equipment (${place})`).toBe(expected);
      const cyl = await t.db("cylinders").where({ id: records.cylinder[place] }).first("tare_g");
      const w = await call("cylinders/[id]/weighings", "POST", {
        params: { id: String(records.cylinder[place]) },
        body: { weighedOn: "2026-11-20", grossAmount: Number(cyl.tare_g) + 500, grossUnit: "g", refrigerant: "R-410A" },
      });
      expect(w.status, `${role} weighs cylinder (${place})`).toBe(expected === 200 ? 201 : expected);
      const s = await call("appliances/[id]/status", "POST", {
        params: { id: String(records.appliance[place]) },
        body: { status: "retired", on: "2026-11-20", reason: `Taken out by ${role}` },
      });
      expect(s.status, `${role} retires appliance (${place})`).toBe(expected);
      if (expected === 200) {
        // Put it back so later roles see the same starting point.
        const back = await call("appliances/[id]/status", "POST", {
          params: { id: String(records.appliance[place]) },
          body: { status: "in_service", on: "2026-11-21", reason: "Back in service" },
        });
        expect(back.status).toBe(200);
      } else {
        expect(await count("activity"), `${role} refused (${place}) writes no activity`).toBe(before.activity);
        expect(await count("amendments")).toBe(before.amendments);
        expect(await count("cylinder_weighings")).toBe(before.weighings);
      }
    }
  });

  it("adds records only to branches they keep", async () => {
    await signInAs(role);
    for (const place of PLACES) {
      const expected = CREATE[role][place];
      const before = {
        appliances: await count("appliances"),
        cylinders: await count("cylinders"),
        equipment: await count("recovery_equipment"),
        sites: await count("sites"),
      };
      const a = await call("appliances", "POST", {
        body: {
          branchId: branch[place],
          siteChoice: "new",
          newSiteName: "Matrix test site",
          customerChoice: "new",
          newCustomerName: "Matrix test customer",
          tag: unique("MATRIX-RTU"),
          description: "Rooftop unit added by the authorization matrix",
          category: "packaged_rooftop",
          refrigerant: "r410a",
          fullChargeAmount: 12.5,
          fullChargeUnit: "lb",
          fullChargeMethod: "nameplate",
          factorySealed: false,
        },
      });
      expect(a.status, `${role} adds an appliance (${place})`).toBe(expected);
      const c = await call("cylinders", "POST", {
        body: {
          branchId: branch[place],
          serial: unique("MATRIX-C"),
          waterCapacityAmount: 50,
          waterCapacityUnit: "lb",
          tareAmount: 17.5,
          tareUnit: "lb",
          lastRequalifiedOn: "2025-01-10",
        },
      });
      expect(c.status, `${role} adds a cylinder (${place})`).toBe(expected);
      const e = await call("equipment", "POST", {
        body: { branchId: branch[place], serial: unique("MATRIX-RE"), certificationState: "unknown" },
      });
      expect(e.status, `${role} adds equipment (${place})`).toBe(expected);
      if (expected !== 201) {
        expect(await count("appliances")).toBe(before.appliances);
        expect(await count("cylinders")).toBe(before.cylinders);
        expect(await count("recovery_equipment")).toBe(before.equipment);
        expect(await count("sites"), "no site is created for a refused appliance").toBe(before.sites);
      }
    }
  });

  it("uploads and reads certification evidence only where allowed", async () => {
    await signInAs(role);
    for (const place of PLACES) {
      const form = new FormData();
      form.set("file", new Blob([new Uint8Array(cardPng(64, 40))], { type: "image/png" }), "label.png");
      const up = await call("equipment/[id]/evidence", "POST", { params: { id: String(records.equipment[place]) }, form });
      expect(up.status, `${role} uploads evidence (${place})`).toBe(WRITE[role][place] === 200 ? 201 : WRITE[role][place]);
      const down = await call("equipment/[id]/evidence", "GET", { params: { id: String(records.equipment[place]) } });
      // Readers get the file, or 404 when the (demo) file is not in the store; others get 404.
      if (READ[role][place] !== 200) expect(down.status).toBe(404);
      else expect([200, 404]).toContain(down.status);
    }
  });
});

describe("bad input and uploads", () => {
  it("an invalid cylinder names the field and writes nothing", async () => {
    await signInAs("branch_manager");
    const before = { cylinders: await count("cylinders"), activity: await count("activity") };
    const res = await call("cylinders", "POST", {
      body: {
        branchId: branch.own,
        serial: "MATRIX-BAD",
        waterCapacityAmount: 50,
        waterCapacityUnit: "lb",
        tareAmount: "",
        tareUnit: "lb",
      },
    });
    expect(res.status).toBe(400);
    const fieldErrors = (res.json.error as { fieldErrors: Record<string, string[]> }).fieldErrors;
    expect(fieldErrors.tareAmount?.[0]).toContain("tare weight");
    expect(await count("cylinders")).toBe(before.cylinders);
    expect(await count("activity")).toBe(before.activity);
  });

  it("a renamed executable is refused as evidence, and the client's file name is never used", async () => {
    await signInAs("branch_manager");
    const form = new FormData();
    form.set("file", new Blob([new Uint8Array([0x4d, 0x5a, 0x90, 0x00, 0x03])], { type: "image/jpeg" }), "label.jpg");
    const res = await call("equipment/[id]/evidence", "POST", { params: { id: String(records.equipment.own) }, form });
    expect(res.status).toBe(400);
    expect((res.json.error as { fieldErrors: Record<string, string[]> }).fieldErrors.file?.[0]).toMatch(/Only photos/);
    const keys = [...stored.keys()];
    expect(keys.length).toBeGreaterThan(0);
    for (const key of keys) {
      expect(key).not.toContain("passwd");
      expect(key).not.toContain("..");
    }
  });

  it("a weighing lighter than the empty cylinder is refused on the reading's field", async () => {
    await signInAs("branch_manager");
    const before = await count("cylinder_weighings");
    const res = await call("cylinders/[id]/weighings", "POST", {
      params: { id: String(records.cylinder.own) },
      body: { weighedOn: "2026-11-20", grossAmount: 1, grossUnit: "lb" },
    });
    expect(res.status).toBe(400);
    expect((res.json.error as { fieldErrors: Record<string, string[]> }).fieldErrors.grossAmount?.[0]).toMatch(
      /lighter than the empty cylinder/,
    );
    expect(await count("cylinder_weighings")).toBe(before);
  });

  it("a weighing of another cylinder cannot be corrected or voided through this one", async () => {
    await signInAs("branch_manager");
    const cyl = await t.db("cylinders").where({ id: records.cylinder.own }).first("tare_g");
    const made = await call("cylinders/[id]/weighings", "POST", {
      params: { id: String(records.cylinder.own) },
      body: { weighedOn: "2026-11-22", grossAmount: Number(cyl.tare_g) + 100, grossUnit: "g", refrigerant: "R-410A" },
    });
    expect(made.status).toBe(201);
    const weighingId = String(made.json.id);
    const otherOwn = Number(
      (await t.db("cylinders").where({ branch_id: branch.own }).whereNot({ id: records.cylinder.own }).first("id")).id,
    );
    const amend = await call("cylinders/[id]/weighings/[weighingId]", "PATCH", {
      params: { id: String(otherOwn), weighingId },
      body: { weighedOn: "2026-11-22", grossAmount: Number(cyl.tare_g) + 90, grossUnit: "g", reason: "Scale misread" },
    });
    expect(amend.status).toBe(404);
    const voided = await call("cylinders/[id]/weighings/[weighingId]/void", "POST", {
      params: { id: String(otherOwn), weighingId },
      body: { reason: "Entered twice" },
    });
    expect(voided.status).toBe(404);
    const ok = await call("cylinders/[id]/weighings/[weighingId]/void", "POST", {
      params: { id: String(records.cylinder.own), weighingId },
      body: { reason: "Entered twice" },
    });
    expect(ok.status).toBe(200);
  });
});
