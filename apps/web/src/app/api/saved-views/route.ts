import { NextResponse } from "next/server";
import { savedViewInput } from "@coldtrail/core";
import { listSavedViews, saveView } from "@coldtrail/db";
import { route } from "@/lib/api/route";

/** The signed-in person's own saved views of the findings table. */
export const GET = route({ can: ["read", "Finding"] }, async ({ actor, db }) => {
  return { rows: await listSavedViews(db, { actor: { userId: actor.userId, organisationId: actor.organisationId }, list: "findings" }) };
});

/** Save the current filters, sort and grouping under a name (the same name replaces the view). */
export const POST = route({ idempotent: true, can: ["read", "Finding"], body: savedViewInput }, async ({ actor, db, body }) => {
  const view = await saveView(db, {
    actor: { userId: actor.userId, organisationId: actor.organisationId },
    list: body.list,
    name: body.name,
    query: body.query,
  });
  return NextResponse.json(view, { status: 201 });
});
