import { afterAll, beforeAll, expect, it } from "vitest";
import {
  APPLIANCE_SORT_FIELDS,
  CERTIFICATION_SORT_FIELDS,
  CYLINDER_SORT_FIELDS,
  EQUIPMENT_SORT_FIELDS,
  JOB_SORT_FIELDS,
  PEOPLE_SORT_FIELDS,
  applianceListQuery,
  certificationListQuery,
  cylinderListQuery,
  disposalListQuery,
  equipmentListQuery,
  grantListQuery,
  importListQuery,
  jobListQuery,
  peopleListQuery,
  purchaseListQuery,
  shipmentListQuery,
  branchListQuery,
  type AppAbility,
} from "@coldtrail/core";
import {
  DEMO_SIGN_INS,
  getAppliance,
  getCylinder,
  getDisposalRecord,
  getDisposalStatement,
  getEquipment,
  getJob,
  getPerson,
  getPurchase,
  getShipment,
  listAdminBranches,
  listApplianceJobs,
  listApplianceOptions,
  listAppliances,
  listBranches,
  listCertifications,
  listCustomerOptions,
  listCylinderMovements,
  listCylinderOptions,
  listCylinderWeighings,
  listCylinders,
  listDisposals,
  listEquipment,
  listEquipmentOptions,
  listImports,
  listInspectorGrants,
  listJobs,
  listPeople,
  listPersonCertifications,
  listPurchases,
  listRecordActivity,
  listRegisterActivity,
  listShipments,
  listShopQueue,
  listSiteOptions,
  monthlyDisposalTotals,
  reviewApplianceLeaks,
  scopeByAbility,
  type Knex,
} from "@coldtrail/db";
import { NOW, PG_URL, ROLES, describePg, destroyPair, same, seededPair, signIn, type Pair } from "./pg-helpers";

/**
 * The same demo data in SQLite and PostgreSQL: every list and detail read the app serves returns the
 * same rows in the same order with the same JavaScript values, for every demo role (both
 * organisations), across every sort column in both directions, filters and pages.
 */

let pair: Pair;

beforeAll(async () => {
  if (!PG_URL) return;
  pair = await seededPair();
}, 180_000);
afterAll(async () => {
  await destroyPair(pair);
});

const DIRS = ["asc", "desc"] as const;

/** The ability of a demo person, read from the database at hand. */
const abilityIn = async (db: Knex, email: string): Promise<AppAbility> => (await signIn(db, email)).ability;

describePg("jobs list (CASL scope per role)", () => {
  for (const [role, email] of ROLES) {
    it(`${role}: every sort, both directions, pages, filters and search agree`, async () => {
      const list = (query: Record<string, unknown>) => async (db: Knex) =>
        listJobs(db, { scope: scopeByAbility(await abilityIn(db, email), "read", "Job", "jobs"), query: jobListQuery.parse(query) });
      const first = await same(pair, list({ pageSize: 200 }), `${role} default`);
      expect(first.total, `${role} sees some jobs`).toBeGreaterThan(0);
      for (const sort of JOB_SORT_FIELDS) {
        for (const dir of DIRS) {
          await same(pair, list({ sort, dir, pageSize: 50 }), `${role} ${sort} ${dir}`);
          await same(pair, list({ sort, dir, pageSize: 50, page: 3 }), `${role} ${sort} ${dir} page 3`);
        }
      }
      await same(pair, list({ q: "rack", pageSize: 200 }), `${role} search`);
      await same(pair, list({ q: "RTU_", pageSize: 200 }), `${role} search with a LIKE wildcard`);
      await same(pair, list({ kind: "recovery", from: "2025-06-01", to: "2026-03-31", pageSize: 200 }), `${role} kind and dates`);
      await same(pair, list({ voided: "include", pageSize: 200, sort: "amount" }), `${role} voided included`);
      await same(pair, list({ voided: "only", pageSize: 200 }), `${role} voided only`);
    });
  }

  it("job detail, with its movements and leak rate, for every job the officer reads on one branch", async () => {
    const jobs = await pair.sqlite.db("jobs").where({ branch_id: 1 }).orderBy("id").limit(60).pluck("id");
    for (const id of jobs) {
      await same(
        pair,
        async (db) =>
          getJob(db, {
            scope: scopeByAbility(await abilityIn(db, DEMO_SIGN_INS.compliance_officer), "read", "Job", "jobs"),
            id: Number(id),
          }),
        `job ${id}`,
      );
    }
  });
});

describePg("registers", () => {
  for (const [role, email] of ROLES) {
    it(`${role}: appliances, cylinders and recovery equipment agree on every sort`, async () => {
      const appliances = (query: Record<string, unknown>) => async (db: Knex) =>
        listAppliances(db, {
          scope: scopeByAbility(await abilityIn(db, email), "read", "Appliance", "appliances"),
          query: applianceListQuery.parse(query),
        });
      const cylinders = (query: Record<string, unknown>) => async (db: Knex) => {
        const { actor, ability } = await signIn(db, email);
        return listCylinders(db, {
          scope: scopeByAbility(ability, "read", "Cylinder", "cylinders"),
          organisationId: actor.organisationId,
          query: cylinderListQuery.parse(query),
          now: NOW,
        });
      };
      const equipment = (query: Record<string, unknown>) => async (db: Knex) =>
        listEquipment(db, {
          scope: scopeByAbility(await abilityIn(db, email), "read", "RecoveryEquipment", "recovery_equipment"),
          query: equipmentListQuery.parse(query),
        });
      for (const dir of DIRS) {
        for (const sort of APPLIANCE_SORT_FIELDS)
          await same(pair, appliances({ sort, dir, pageSize: 200 }), `${role} appliances ${sort} ${dir}`);
        for (const sort of CYLINDER_SORT_FIELDS)
          await same(pair, cylinders({ sort, dir, pageSize: 200 }), `${role} cylinders ${sort} ${dir}`);
        for (const sort of EQUIPMENT_SORT_FIELDS)
          await same(pair, equipment({ sort, dir, pageSize: 200 }), `${role} equipment ${sort} ${dir}`);
      }
      await same(pair, appliances({ q: "walk", status: "in_service", pageSize: 200 }), `${role} appliance search`);
      await same(pair, appliances({ refrigerant: "r-22", category: "commercial_refrigeration" }), `${role} appliance filters`);
      for (const requalification of ["overdue", "due_soon", "current", "unknown"]) {
        await same(pair, cylinders({ requalification, pageSize: 200 }), `${role} cylinders ${requalification}`);
      }
      await same(pair, cylinders({ q: "c-9", pageSize: 200 }), `${role} cylinder search`);
      await same(pair, equipment({ q: "unreg", pageSize: 200 }), `${role} equipment search`);
      await same(pair, equipment({ certificationState: "not_certified" }), `${role} equipment filter`);
    });
  }

  it("register details, histories, weighings, movements and leak reviews agree (officer)", async () => {
    const officer = DEMO_SIGN_INS.compliance_officer;
    const appliances = await pair.sqlite
      .db("appliances")
      .where({ organisation_id: 1 })
      .where((q) => q.where("tag", "like", "%-9%").orWhere("id", "<", 15))
      .orderBy("id")
      .pluck("id");
    expect(appliances.length).toBeGreaterThan(10);
    for (const raw of appliances) {
      const id = Number(raw);
      await same(
        pair,
        async (db) => getAppliance(db, { scope: scopeByAbility(await abilityIn(db, officer), "read", "Appliance", "appliances"), id }),
        `appliance ${id}`,
      );
      await same(
        pair,
        async (db) =>
          listApplianceJobs(db, {
            scope: scopeByAbility(await abilityIn(db, officer), "read", "Job", "jobs"),
            applianceId: id,
            query: { page: 1, pageSize: 100, dir: "asc" },
          }),
        `appliance ${id} jobs`,
      );
      await same(pair, (db) => reviewApplianceLeaks(db, { organisationId: 1, applianceId: id, now: NOW }), `appliance ${id} leaks`);
      await same(
        pair,
        (db) => listRegisterActivity(db, { organisationId: 1, subjectType: "Appliance", subjectId: id }),
        `appliance ${id} activity`,
      );
    }
    const cylinders = await pair.sqlite.db("cylinders").where({ organisation_id: 1 }).orderBy("id").pluck("id");
    for (const raw of cylinders) {
      const id = Number(raw);
      await same(
        pair,
        async (db) =>
          getCylinder(db, { scope: scopeByAbility(await abilityIn(db, officer), "read", "Cylinder", "cylinders"), id, now: NOW }),
        `cylinder ${id}`,
      );
      await same(
        pair,
        (db) => listCylinderWeighings(db, { cylinderId: id, query: { page: 1, pageSize: 100, dir: "desc" } }),
        `cylinder ${id} weighings`,
      );
      await same(
        pair,
        async (db) =>
          listCylinderMovements(db, {
            cylinderId: id,
            jobScope: scopeByAbility(await abilityIn(db, officer), "read", "Job", "jobs"),
            query: { page: 1, pageSize: 100, dir: "asc" },
          }),
        `cylinder ${id} movements`,
      );
    }
    const equipment = await pair.sqlite.db("recovery_equipment").orderBy("id").pluck("id");
    for (const raw of equipment) {
      const id = Number(raw);
      await same(
        pair,
        async (db) =>
          getEquipment(db, { scope: scopeByAbility(await abilityIn(db, officer), "read", "RecoveryEquipment", "recovery_equipment"), id }),
        `equipment ${id}`,
      );
    }
  });

  it("pickers of the job and appliance forms agree (a manager and a technician)", async () => {
    for (const email of [DEMO_SIGN_INS.branch_manager, DEMO_SIGN_INS.technician, DEMO_SIGN_INS.owner]) {
      for (const branchId of [1, 2, 3, 4]) {
        await same(
          pair,
          async (db) =>
            listApplianceOptions(db, {
              scope: scopeByAbility(await abilityIn(db, email), "read", "Appliance", "appliances"),
              branchIds: [branchId],
              q: "r",
              limit: 50,
            }),
          `appliance options ${branchId}`,
        );
        await same(
          pair,
          async (db) =>
            listCylinderOptions(db, {
              scope: scopeByAbility(await abilityIn(db, email), "read", "Cylinder", "cylinders"),
              branchId,
              limit: 50,
            }),
          `cylinder options ${branchId}`,
        );
        await same(
          pair,
          async (db) =>
            listEquipmentOptions(db, {
              scope: scopeByAbility(await abilityIn(db, email), "read", "RecoveryEquipment", "recovery_equipment"),
              branchId,
              limit: 50,
            }),
          `equipment options ${branchId}`,
        );
        await same(
          pair,
          async (db) =>
            listSiteOptions(db, { scope: scopeByAbility(await abilityIn(db, email), "read", "Site", "sites"), branchId, limit: 50 }),
          `sites ${branchId}`,
        );
        await same(
          pair,
          async (db) =>
            listSiteOptions(db, {
              scope: scopeByAbility(await abilityIn(db, email), "read", "Site", "sites"),
              branchId,
              q: "store",
              limit: 50,
            }),
          `sites ${branchId} search`,
        );
        await same(
          pair,
          async (db) =>
            listCustomerOptions(db, {
              scope: scopeByAbility(await abilityIn(db, email), "read", "Customer", "customers"),
              branchId,
              limit: 50,
            }),
          `customers ${branchId}`,
        );
      }
    }
  });
});

describePg("disposals, reclaim shipments and purchases", () => {
  for (const [role, email] of ROLES) {
    it(`${role}: lists agree on every sort and filter`, async () => {
      for (const type of ["record", "statement"] as const) {
        for (const sort of ["date", "appliance", "branch", "refrigerant", "amount"] as const) {
          for (const dir of DIRS) {
            await same(
              pair,
              async (db) =>
                listDisposals(db, {
                  scope: scopeByAbility(await abilityIn(db, email), "read", "Disposal", "d"),
                  query: disposalListQuery.parse({ type, sort, dir, pageSize: 200 }),
                }),
              `${role} ${type}s ${sort} ${dir}`,
            );
          }
        }
        await same(
          pair,
          async (db) =>
            listDisposals(db, {
              scope: scopeByAbility(await abilityIn(db, email), "read", "Disposal", "d"),
              query: disposalListQuery.parse({ type, q: "sa-", voided: "include" }),
            }),
          `${role} ${type} search`,
        );
      }
      for (const sort of ["date", "branch", "reclaimer", "amount"] as const) {
        for (const dir of DIRS) {
          await same(
            pair,
            async (db) =>
              listShipments(db, {
                scope: scopeByAbility(await abilityIn(db, email), "read", "ReclaimShipment", "s"),
                query: shipmentListQuery.parse({ sort, dir, pageSize: 200 }),
              }),
            `${role} shipments ${sort} ${dir}`,
          );
        }
      }
      for (const sort of ["date", "branch", "supplier", "refrigerant", "amount"] as const) {
        for (const dir of DIRS) {
          await same(
            pair,
            async (db) =>
              listPurchases(db, {
                scope: scopeByAbility(await abilityIn(db, email), "read", "Purchase", "p"),
                query: purchaseListQuery.parse({ sort, dir, pageSize: 200 }),
              }),
            `${role} purchases ${sort} ${dir}`,
          );
        }
      }
      await same(
        pair,
        async (db) =>
          listPurchases(db, {
            scope: scopeByAbility(await abilityIn(db, email), "read", "Purchase", "p"),
            query: purchaseListQuery.parse({ refrigerant: "R-410A", from: "2025-01-01", to: "2025-12-31" }),
          }),
        `${role} purchase filters`,
      );
      await same(
        pair,
        async (db) => listShopQueue(db, { scope: scopeByAbility(await abilityIn(db, email), "read", "Appliance", "appliances") }),
        `${role} shop queue`,
      );
    });
  }

  it("details and monthly totals agree (officer)", async () => {
    const officer = DEMO_SIGN_INS.compliance_officer;
    const detail = async <T>(table: string, read: (db: Knex, ability: AppAbility, id: number) => Promise<T>) => {
      const ids = await pair.sqlite.db(table).where({ organisation_id: 1 }).orderBy("id").pluck("id");
      expect(ids.length, table).toBeGreaterThan(0);
      for (const id of ids) await same(pair, async (db) => read(db, await abilityIn(db, officer), Number(id)), `${table} ${id}`);
    };
    await detail("disposal_records", (db, ability, id) =>
      getDisposalRecord(db, { scope: scopeByAbility(ability, "read", "Disposal", "d"), id }),
    );
    await detail("disposal_statements", (db, ability, id) =>
      getDisposalStatement(db, { scope: scopeByAbility(ability, "read", "Disposal", "d"), id }),
    );
    await detail("reclaim_shipments", (db, ability, id) =>
      getShipment(db, { scope: scopeByAbility(ability, "read", "ReclaimShipment", "s"), id }),
    );
    await detail("purchases", (db, ability, id) => getPurchase(db, { scope: scopeByAbility(ability, "read", "Purchase", "p"), id }));
    for (const branchId of [1, 2, 3, 4]) {
      for (const year of [2025, 2026])
        await same(pair, (db) => monthlyDisposalTotals(db, { organisationId: 1, branchId, year }), `monthly ${branchId} ${year}`);
    }
  });
});

describePg("people, branches, inspector access, certifications and imports", () => {
  for (const [role, email] of ROLES) {
    it(`${role}: people (admin) and branches lists agree`, async () => {
      for (const sort of PEOPLE_SORT_FIELDS) {
        for (const dir of DIRS) {
          await same(
            pair,
            async (db) =>
              listPeople(db, {
                scope: scopeByAbility(await abilityIn(db, email), "read", "User", "pb"),
                query: peopleListQuery.parse({ sort, dir, pageSize: 100 }),
              }),
            `${role} people ${sort} ${dir}`,
          );
        }
      }
      for (const query of [
        { q: "an" },
        { role: "technician" },
        { branchId: 3 },
        { status: "active" },
        { status: "invited" },
        { q: "KESTRELMOOR" },
      ]) {
        await same(
          pair,
          async (db) =>
            listPeople(db, {
              scope: scopeByAbility(await abilityIn(db, email), "read", "User", "pb"),
              query: peopleListQuery.parse({ ...query, pageSize: 100 }),
            }),
          `${role} people ${JSON.stringify(query)}`,
        );
      }
      for (const archived of ["exclude", "include", "only"] as const) {
        await same(
          pair,
          async (db) =>
            listAdminBranches(db, {
              scope: scopeByAbility(await abilityIn(db, email), "read", "Branch", "branches"),
              query: branchListQuery.parse({ archived }),
            }),
          `${role} branches ${archived}`,
        );
      }
      await same(
        pair,
        async (db) =>
          listInspectorGrants(db, {
            scope: scopeByAbility(await abilityIn(db, email), "read", "InspectorGrant", "g"),
            query: grantListQuery.parse({}),
            now: NOW,
          }),
        `${role} grants`,
      );
    });

    it(`${role}: certifications and imports lists agree`, async () => {
      for (const sort of CERTIFICATION_SORT_FIELDS) {
        for (const dir of DIRS) {
          await same(
            pair,
            async (db) => {
              const { actor, ability } = await signIn(db, email);
              return listCertifications(db, {
                scope: scopeByAbility(ability, "read", "Certification", "certifications"),
                query: certificationListQuery.parse({ sort, dir, pageSize: 100 }),
                actorUserId: actor.userId,
              });
            },
            `${role} certifications ${sort} ${dir}`,
          );
        }
      }
      for (const query of [{ state: "pending" }, { state: "verified", branchId: 3 }, { mine: "1" }, { q: "type" }, { q: "kai" }]) {
        await same(
          pair,
          async (db) => {
            const { actor, ability } = await signIn(db, email);
            return listCertifications(db, {
              scope: scopeByAbility(ability, "read", "Certification", "certifications"),
              query: certificationListQuery.parse(query),
              actorUserId: actor.userId,
            });
          },
          `${role} certifications ${JSON.stringify(query)}`,
        );
      }
      await same(
        pair,
        async (db) =>
          listImports(db, {
            scope: scopeByAbility(await abilityIn(db, email), "read", "Import", "imports"),
            query: importListQuery.parse({}),
          }),
        `${role} imports`,
      );
    });
  }

  it("every person's detail, certifications and history agree (owner)", async () => {
    const ids = await pair.sqlite.db("users").orderBy("id").pluck("id");
    for (const raw of ids) {
      const id = Number(raw);
      await same(
        pair,
        async (db) =>
          getPerson(db, { scope: scopeByAbility(await abilityIn(db, DEMO_SIGN_INS.owner), "read", "User", "pb"), id, now: NOW }),
        `person ${id}`,
      );
      await same(
        pair,
        async (db) =>
          listPersonCertifications(db, {
            scope: scopeByAbility(await abilityIn(db, DEMO_SIGN_INS.owner), "read", "Certification", "pb"),
            userId: id,
          }),
        `person ${id} cards`,
      );
      await same(
        pair,
        async (db) =>
          listRecordActivity(db, {
            scope: scopeByAbility(await abilityIn(db, DEMO_SIGN_INS.owner), "read", "Activity", "activity"),
            subjectType: "User",
            subjectId: id,
            query: { page: 1, pageSize: 100 },
          }),
        `person ${id} history`,
      );
    }
    for (const org of [1, 2])
      await same(pair, (db) => listBranches(db, { organisationId: org, includeArchived: true }), `branches of ${org}`);
  });
});
