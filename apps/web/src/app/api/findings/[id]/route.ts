import { getRule } from "@coldtrail/core";
import { DomainError, getFinding, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { canOnFinding, pathId } from "../_lib/access";

/** One finding with the rule's explanation, its history, comments and evidence; 404 when not readable. */
export const GET = route<undefined, undefined, { id: string }>({ can: ["read", "Finding"] }, async ({ ability, actor, db, params }) => {
  const id = pathId(params.id, "finding");
  const finding = await getFinding(db, {
    organisationId: actor.organisationId,
    scope: scopeByAbility(ability, "read", "Finding", "findings"),
    id,
  });
  if (!finding) throw new DomainError("not_found", "No such finding");
  const rule = getRule(finding.ruleId);
  const can = (action: Parameters<typeof canOnFinding>[1]) => canOnFinding(ability, action, finding);
  return {
    ...finding,
    rule: rule ? { id: rule.id, title: rule.title, explanation: rule.explanation, citation: rule.citation, pack: rule.pack } : null,
    allowed: {
      assign: can("assign"),
      proposeFix: can("propose_fix"),
      accept: can("accept"),
      reopen: can("reopen"),
      waive: can("waive"),
      comment: can("comment"),
    },
  };
});
