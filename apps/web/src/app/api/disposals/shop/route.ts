import { NextResponse } from "next/server";
import { z } from "zod";
import { ForbiddenError, subject } from "@casl/ability";
import { shopDisposalBatchInput } from "@coldtrail/core";
import { DomainError, getApplianceRef, listShopQueue, recordShopDisposals, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";

const queueQuery = z.object({ branchId: z.coerce.number().int().positive().optional() });

/** Retired units waiting to be scrapped, in the branches the person may log disposals for. */
export const GET = route({ can: ["create", "Job"], query: queueQuery }, async ({ actor, ability, db, query }) => {
  const rows = await listShopQueue(db, { scope: scopeByAbility(ability, "read", "Appliance", "appliances"), branchId: query.branchId });
  return {
    rows: rows.filter((r) => ability.can("create", subject("Disposal", { organisationId: actor.organisationId, branchId: r.branchId }))),
  };
});

/** The shop's scrap run: a disposal job and its record or signed statement for each unit picked, all or nothing. */
export const POST = route(
  { idempotent: true, can: ["create", "Job"], body: shopDisposalBatchInput },
  async ({ actor, ability, db, body }) => {
    const first = await getApplianceRef(db, { organisationId: actor.organisationId, id: body.items[0]!.applianceId });
    if (!first) throw new DomainError("invalid", "That appliance is not in your organisation's register", "items.0.applianceId");
    const where = { organisationId: actor.organisationId, branchId: first.branchId };
    ForbiddenError.from(ability).throwUnlessCan("create", subject("Job", { ...where, technicianId: actor.userId }));
    ForbiddenError.from(ability).throwUnlessCan("create", subject("Disposal", where));
    const result = await recordShopDisposals(db, {
      actor: { userId: actor.userId, organisationId: actor.organisationId },
      branchId: first.branchId,
      input: body,
    });
    return NextResponse.json(result, { status: 201 });
  },
);
