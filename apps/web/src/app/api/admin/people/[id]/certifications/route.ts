import { listPersonCertifications, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { visiblePerson } from "../../_shared";

/** A person's certifications, as far as the signed-in person may read them. */
export const GET = route<undefined, undefined, { id: string }>({ can: ["read", "Certification"] }, async ({ ability, db, params }) => {
  const person = await visiblePerson(db, ability, params.id);
  return { rows: await listPersonCertifications(db, { scope: scopeByAbility(ability, "read", "Certification", "pb"), userId: person.id }) };
});
