import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import fc from "fast-check";
import type { z } from "zod";
import { claimAudit, createAudit, runAuditBranches } from "@coldtrail/db";
import { createHarness, METHODS, NOW, routeFiles, type CallOptions, type Harness, type Method } from "./harness";

/**
 * Generated bad payloads against every write route (POST, PUT, PATCH, DELETE), through the real route
 * wrapper and handlers, signed in as the owner (who may write nearly everywhere, so requests reach the
 * deepest checks). For each route: arbitrary JSON, objects with the schema's own field names holding
 * arbitrary values, wrong content types, and random multipart forms. Every payload the route's own schema
 * would refuse must be answered with a 4xx; no payload may cause a 5xx; and a refused request changes no
 * row of any table.
 *
 * FUZZ_RUNS payloads per route (200 in the normal test run; `pnpm fuzz` runs more and prints the counts).
 */

const RUNS = Number(process.env.FUZZ_RUNS ?? 200);
const SEED = Number(process.env.FUZZ_SEED ?? 20261203);

let h: Harness;
const ids: Record<string, number> = {};
const totals = { routes: 0, payloads: 0, refused: 0, accepted: 0, serverErrors: 0 };

/** A real record for each path segment, so payloads reach the body checks of record routes. */
const PARAM_TABLE: Array<[RegExp, string, string]> = [
  [/^admin\/branches\//, "id", "branch"],
  [/^admin\/inspector-grants\//, "id", "grant"],
  [/^admin\/people\//, "id", "person"],
  [/^appliances\//, "id", "appliance"],
  [/^audits\//, "id", "audit"],
  [/^certifications\//, "id", "card"],
  [/^cylinders\//, "id", "cylinder"],
  [/^cylinders\/\[id\]\/weighings\/\[weighingId\]/, "weighingId", "weighing"],
  [/^disposals\/records\//, "id", "disposalRecord"],
  [/^disposals\/statements\//, "id", "statement"],
  [/^equipment\//, "id", "equipment"],
  [/^findings\/\[id\]/, "id", "finding"],
  [/^imports\//, "id", "import"],
  [/^jobs\/\[id\]/, "id", "job"],
  [/^purchases\//, "id", "purchase"],
  [/^saved-views\//, "id", "savedView"],
  [/^shipments\//, "id", "shipment"],
];

function paramsFor(route: string): Record<string, string> {
  const params: Record<string, string> = {};
  for (const [pattern, name, kind] of PARAM_TABLE) {
    if (pattern.test(route) && route.includes(`[${name}]`)) params[name] = String(ids[kind]);
  }
  if (route.startsWith("cylinders/[id]/weighings/[weighingId]")) params.id = String(ids.weighingCylinder);
  return params;
}

type Spec = { body?: z.ZodType; accepts?: string };
type Handler = ((req: Request, ctx: unknown) => Promise<Response>) & { spec?: Spec };

/** The field names of an object schema (through refinements), to build payloads that look almost right. */
function fieldNames(schema: z.ZodType | undefined): string[] {
  let s = schema as unknown as
    { shape?: Record<string, unknown>; def?: { in?: unknown; schema?: unknown; innerType?: unknown } } | undefined;
  for (let i = 0; i < 5 && s && !s.shape; i++) s = (s.def?.in ?? s.def?.schema ?? s.def?.innerType) as typeof s;
  return s?.shape ? Object.keys(s.shape) : [];
}

const nasty = fc.oneof(
  fc.constantFrom(
    "",
    " ",
    "0",
    "-1",
    "1e3",
    "NaN",
    "Infinity",
    "null",
    "true",
    "2026-02-30",
    "9999-99-99",
    "../../etc/passwd",
    "<script>",
    "' OR 1=1 --",
    "\u0000",
    "\r\n",
    "💥".repeat(50),
  ),
  fc.string({ maxLength: 40 }),
  fc.string({ minLength: 2000, maxLength: 6000 }),
  fc.integer(),
  fc.double(),
  fc.constantFrom(Number.MAX_SAFE_INTEGER, -Number.MAX_SAFE_INTEGER, 2 ** 53 + 1, -0, 1e308),
  fc.boolean(),
  fc.constant(null),
  fc.array(fc.jsonValue({ maxDepth: 1 }), { maxLength: 5 }),
  fc.dictionary(fc.string({ maxLength: 8 }), fc.jsonValue({ maxDepth: 1 }), { maxKeys: 4 }),
);

function payloads(fields: string[]) {
  const almost =
    fields.length > 0
      ? fc.dictionary(fc.constantFrom(...fields, "__proto__", "constructor", "organisationId", "branchId"), nasty, {
          maxKeys: fields.length + 2,
        })
      : fc.dictionary(fc.string({ maxLength: 10 }), nasty, { maxKeys: 4 });
  return fc.oneof(
    { weight: 5, arbitrary: almost.map((body) => ({ kind: "json" as const, body })) },
    { weight: 2, arbitrary: fc.jsonValue({ maxDepth: 3 }).map((body) => ({ kind: "json" as const, body })) },
    { weight: 1, arbitrary: fc.string({ maxLength: 200 }).map((raw) => ({ kind: "raw" as const, raw, contentType: "application/json" })) },
    { weight: 1, arbitrary: fc.string({ maxLength: 200 }).map((raw) => ({ kind: "raw" as const, raw, contentType: "text/plain" })) },
    {
      weight: 2,
      arbitrary: fc
        .tuple(
          fc.dictionary(
            fc.constantFrom(...fields, "file", "card", "document", "note", "reason", "kind", "branchId"),
            fc.string({ maxLength: 60 }),
            { maxKeys: 6 },
          ),
          fc.option(fc.uint8Array({ maxLength: 512 }), { nil: undefined }),
          fc.constantFrom("file", "card", "document"),
          fc.constantFrom("photo.png", "card.jpg", "a.pdf", "../x.png", "rows.csv", "book.xlsx", "name\r\n.png"),
        )
        .map(([fields, bytes, fileField, fileName]) => ({ kind: "form" as const, fields, bytes, fileField, fileName })),
    },
  );
}

function toCall(p: ReturnType<typeof payloads> extends fc.Arbitrary<infer T> ? T : never): CallOptions {
  if (p.kind === "json") return { body: p.body };
  if (p.kind === "raw") return { raw: p.raw, contentType: p.contentType };
  const form = new FormData();
  for (const [k, v] of Object.entries(p.fields)) form.append(k, v);
  if (p.bytes) form.set(p.fileField, new Blob([new Uint8Array(p.bytes)]), p.fileName);
  return { form };
}

beforeAll(async () => {
  h = await createHarness();
  const first = async (table: string, where: Record<string, unknown> = {}) =>
    Number((await h.t.db(table).where(where).orderBy("id").first("id")).id);
  const col = await first("branches", { code: "COL" });
  const officer = h.actors.compliance_officer;
  const audit = await createAudit(h.t.db, {
    actor: { userId: officer.userId, organisationId: 1 },
    input: { branchIds: [col], periodFrom: "2024-12-01", periodTo: "2026-12-01", packs: ["us_federal"] },
    now: NOW,
  });
  await claimAudit(h.t.db, { id: audit, now: NOW });
  await runAuditBranches(h.t.db, { id: audit, now: () => NOW });
  ids.audit = audit;
  ids.branch = col;
  ids.finding = await first("findings", { branch_id: col });
  ids.grant = await first("inspector_grants");
  ids.person = Number(
    (await h.t.db("memberships").where({ branch_id: col, role: "technician" }).orderBy("user_id", "desc").first("user_id")).user_id,
  );
  ids.appliance = await first("appliances", { branch_id: col });
  ids.card = await first("certifications", { organisation_id: 1 });
  ids.cylinder = await first("cylinders", { branch_id: col });
  const weighing = await h.t.db("cylinder_weighings").where({ branch_id: col }).orderBy("id").first();
  ids.weighing = Number(weighing.id);
  ids.weighingCylinder = Number(weighing.cylinder_id);
  ids.disposalRecord = await first("disposal_records", { organisation_id: 1 });
  ids.statement = await first("disposal_statements", { organisation_id: 1 });
  ids.equipment = await first("recovery_equipment", { branch_id: col });
  ids.job = await first("jobs", { branch_id: col });
  ids.purchase = await first("purchases", { branch_id: col });
  ids.shipment = await first("reclaim_shipments", { branch_id: col });
  h.signInAs("owner");
  const form = new FormData();
  form.set("kind", "cylinders");
  form.set("branchId", String(col));
  form.set("file", new Blob(["serial,refrigerant\nFZ-1,R-410A\n"], { type: "text/csv" }), "cylinders.csv");
  ids.import = Number((await h.call("imports", "POST", { form })).json!.id);
  ids.savedView = Number((await h.call("saved-views", "POST", { body: { name: "Fuzz view", query: {} } })).json!.id);
}, 240_000);

afterAll(async () => {
  console.info(
    `fuzz: ${totals.routes} write routes, ${totals.payloads} payloads (${totals.refused} refused, ${totals.accepted} accepted as valid), ${totals.serverErrors} answered 5xx`,
  );
  vi.resetModules();
  await h?.t.destroy();
});

describe("fuzzing every write route", () => {
  it("finds the write routes", async () => {
    let writes = 0;
    for (const route of routeFiles()) {
      const mod = (await h.load(route)) as Partial<Record<Method, Handler>>;
      for (const m of METHODS) if (m !== "GET" && mod[m] && !route.startsWith("auth/")) writes++;
    }
    expect(writes).toBeGreaterThan(50);
  });

  for (const route of routeFiles()) {
    if (route.startsWith("auth/")) continue; // next-auth's own handler; the sign-in tests cover it
    it(`${route}: bad payloads are refused with a 4xx, never a 5xx, and change nothing`, async () => {
      const mod = (await h.load(route)) as Partial<Record<Method, Handler>>;
      const methods = METHODS.filter((m) => m !== "GET" && mod[m]);
      if (methods.length === 0) return;
      h.signInAs(route === "password/forgot" || route === "password/reset" || route === "invitation/accept" ? null : "owner");
      const params = paramsFor(route);
      for (const method of methods) {
        totals.routes++;
        const spec = mod[method]!.spec ?? {};
        const schema = spec.body;
        const fields = fieldNames(schema);
        const problems: string[] = [];
        await fc.assert(
          fc.asyncProperty(payloads(fields), async (p) => {
            const opts = toCall(p);
            // A payload the route's own schema accepts is not a bad one: it may be saved.
            // (Judged on the body as sent: JSON text, parsed back, as the route reads it.)
            const valid =
              p.kind === "json" && schema !== undefined && schema.safeParse(JSON.parse(JSON.stringify(p.body) ?? "null")).success;
            const before = valid ? "" : await h.fingerprint();
            const res = await h.call(route, method, { ...opts, params });
            totals.payloads++;
            if (res.status >= 500) {
              totals.serverErrors++;
              problems.push(
                `${method} ${route} ${p.kind} ${JSON.stringify(p.kind === "json" ? p.body : p.kind === "raw" ? p.raw : p.fields).slice(0, 200)} → ${res.status}`,
              );
            }
            if (res.status < 300) {
              totals.accepted++;
              return;
            }
            totals.refused++;
            if (!valid && (await h.fingerprint()) !== before)
              problems.push(`${method} ${route}: a refused request (${res.status}) changed rows`);
          }),
          { numRuns: RUNS, seed: SEED, endOnFailure: true },
        );
        expect(problems).toEqual([]);
      }
    });
  }
});
