import "server-only";
import type { AppAbility } from "@coldtrail/core";
import { DomainError, getPerson, scopeByAbility, type Knex, type PersonDetail } from "@coldtrail/db";
import { recordId } from "../_lib/params";

/** The person in the path if the signed-in person may see them; otherwise 404 (we do not say they exist). */
export async function visiblePerson(db: Knex, ability: AppAbility, id: string | undefined): Promise<PersonDetail> {
  const person = await getPerson(db, { scope: scopeByAbility(ability, "read", "User", "pb"), id: recordId(id, "person") });
  if (!person) throw new DomainError("not_found", "No such person");
  return person;
}
