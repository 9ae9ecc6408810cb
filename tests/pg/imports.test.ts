import { afterAll, beforeAll, expect, it } from "vitest";
import { applianceListQuery, importListQuery, parseCsv, suggestImportMapping } from "@coldtrail/core";
import {
  DEMO_SIGN_INS,
  checkImportRows,
  commitImportRows,
  createImport,
  getImport,
  listAppliances,
  listImportIssues,
  listImports,
  scopeByAbility,
  setImportMapping,
  startImportCommit,
  type Knex,
  type RowSource,
} from "@coldtrail/db";
import { NOW, PG_URL, describePg, destroyPair, same, seededPair, signIn, type Pair } from "./pg-helpers";

/**
 * Spreadsheet imports on both dialects: the same file checked and written gives the same import
 * rows, the same row problems and the same new register entries; the imports list agrees per role.
 */

let pair: Pair;
beforeAll(async () => {
  if (!PG_URL) return;
  pair = await seededPair();
}, 180_000);
afterAll(async () => {
  await destroyPair(pair);
});

const FILES: Record<"appliances" | "cylinders", string> = {
  appliances: [
    "Tag,Description,Category,Refrigerant,Full charge,Full charge unit,Site,Customer",
    "IMP-RTU-01,Rooftop unit over the bakery,Packaged rooftop,R410a,12.5,lb,Linden Row Bakery,Linden Row Foods",
    "COL-RES-101,Duplicate of a registered tag,Packaged rooftop,R-410A,10,lb,Linden Row Bakery,",
    "IMP-RTU-02,Second rooftop unit,Spaceship,R-410A,10,lb,Linden Row Bakery,",
    "IMP-SPLIT-03,Split system in the office,Residential split,R-32,2.1,kg,Linden Row Bakery,",
    "IMP-WALKIN-04,Walk-in cooler,Commercial refrigeration,R-448A,,lb,Linden Row Bakery,",
    "IMP-RTU-01,Same tag again,Packaged rooftop,R-410A,8,lb,Linden Row Bakery,",
  ].join("\n"),
  cylinders: [
    "Serial,Water capacity,Tare,Last requalified",
    "IMP-C-01,50 lb,17.5 lb,2024-03-01",
    "IMP-C-02,,15 lb,2023-01-01",
    "COL-C-001,50 lb,17 lb,2024-01-01",
  ].join("\n"),
};

function source(rows: string[][]): RowSource {
  return {
    rows: (async function* () {
      for (const [i, cells] of rows.entries()) yield { rowNumber: i + 2, cells };
    })(),
    fraction: () => 0.5,
  };
}

/** An import as the manager of Columbus runs it: upload, map, check, write. */
async function runImport(db: Knex, kind: "appliances" | "cylinders"): Promise<number> {
  const { actor } = await signIn(db, DEMO_SIGN_INS.branch_manager);
  const ref = { userId: actor.userId, organisationId: actor.organisationId };
  const branchId = actor.memberships.find((m) => m.role === "branch_manager")!.branchId!;
  const [headings, ...rows] = parseCsv(FILES[kind]);
  const mapping = suggestImportMapping(kind, headings!);
  const id = await createImport(db, {
    actor: ref,
    branchId,
    kind,
    file: { key: `imports/pg/${kind}.csv`, format: "csv", label: `${kind}.csv`, size: FILES[kind].length },
    headings: headings!,
    sample: rows.slice(0, 5),
    mapping,
    now: NOW,
  });
  await setImportMapping(db, { actor: ref, id, mapping });
  await checkImportRows(db, { importId: id, actor: ref, source: source(rows) });
  await startImportCommit(db, { actor: ref, id });
  await commitImportRows(db, { importId: id, actor: ref, source: source(rows) });
  return id;
}

/** Leaves out the clock readings the import steps take themselves. */
function withoutClock<T>(value: T): T {
  return JSON.parse(JSON.stringify(value, (k, v) => (/^(createdAt|updatedAt|checkedAt|finishedAt)$/.test(k) ? undefined : v)));
}

describePg("spreadsheet imports", () => {
  it("check and write the same rows, problems and register entries on both dialects", async () => {
    const result = await same(
      pair,
      async (db) => {
        const ids = { appliances: await runImport(db, "appliances"), cylinders: await runImport(db, "cylinders") };
        const { actor, ability } = await signIn(db, DEMO_SIGN_INS.branch_manager);
        const scope = scopeByAbility(ability, "read", "Import", "imports");
        return {
          ids,
          details: withoutClock([await getImport(db, { scope, id: ids.appliances }), await getImport(db, { scope, id: ids.cylinders })]),
          issues: [
            await listImportIssues(db, {
              organisationId: actor.organisationId,
              importId: ids.appliances,
              kind: "appliances",
              query: { page: 1, pageSize: 50 },
            }),
            await listImportIssues(db, {
              organisationId: actor.organisationId,
              importId: ids.cylinders,
              kind: "cylinders",
              query: { page: 1, pageSize: 50 },
            }),
          ],
          appliances: withoutClock(
            await listAppliances(db, {
              scope: scopeByAbility(ability, "read", "Appliance", "appliances"),
              query: applianceListQuery.parse({ q: "imp-", pageSize: 50 }),
            }),
          ),
          cylinders: await db("cylinders")
            .where("serial", "like", "IMP-%")
            .orderBy("serial")
            .select("serial", "branch_id", "water_capacity_g", "tare_g", "last_requalified_on", "contents_g"),
        };
      },
      "imports",
    );
    expect(result.details.map((d) => d?.state)).toEqual(["imported", "imported"]);
    expect(result.issues[0]!.total).toBe(4);
    expect(result.issues[1]!.total).toBeGreaterThan(0);
    expect(result.appliances.rows.map((a) => a.tag)).toEqual(["IMP-RTU-01", "IMP-SPLIT-03"]);
    expect(result.cylinders.map((c) => c.serial)).toEqual(["IMP-C-01"]);
  });

  it("the imports list agrees for every role that reads it", async () => {
    for (const email of Object.values(DEMO_SIGN_INS)) {
      const page = await same(
        pair,
        async (db) =>
          withoutClock(
            await listImports(db, {
              scope: scopeByAbility((await signIn(db, email)).ability, "read", "Import", "imports"),
              query: importListQuery.parse({}),
            }),
          ),
        email,
      );
      if (email === DEMO_SIGN_INS.branch_manager || email === DEMO_SIGN_INS.owner) expect(page.total, email).toBe(2);
    }
  });
});
