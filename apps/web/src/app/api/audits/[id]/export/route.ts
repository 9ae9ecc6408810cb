import { subject } from "@casl/ability";
import { DomainError, getAuditRun, getOrganisationAuditSettings, listBranches, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { auditWorkbookResponse } from "@/lib/server/audit-export";
import { branchesAllowed, pathId } from "../../../findings/_lib/access";

/**
 * The audit as a spreadsheet, streamed as it is written. What it holds follows the person's own
 * permissions: findings they may read, and records of the audit's branches they may read (an
 * inspector's date window included).
 */
export const GET = route<undefined, undefined, { id: string }>({ can: ["export", "Audit"] }, async ({ actor, ability, db, params }) => {
  const audit = await getAuditRun(db, { organisationId: actor.organisationId, id: pathId(params.id, "audit") });
  if (!audit) throw new DomainError("not_found", "No such audit");
  const { name: organisationName, settings } = await getOrganisationAuditSettings(db, actor.organisationId);
  const branches = await listBranches(db, { organisationId: actor.organisationId, includeArchived: true });
  const inAudit = (ids: { id: number }[]) => ids.map((b) => b.id).filter((id) => audit.branchIds.includes(id));
  const org = actor.organisationId;
  return auditWorkbookResponse(db, {
    audit,
    organisationName,
    branchNames: new Map(branches.map((b) => [b.id, b.name])),
    exportedBy: actor.name,
    settings,
    branchIds: {
      jobs: audit.branchIds,
      leak: inAudit(await branchesAllowed(db, actor, ability, "read", "Appliance")),
      cylinders: audit.branchIds,
      certifications: inAudit(await branchesAllowed(db, actor, ability, "read", "Certification")),
      disposals: audit.branchIds,
    },
    scopes: {
      findings: scopeByAbility(ability, "read", "Finding", "findings"),
      jobs: scopeByAbility(ability, "read", "Job", "jobs"),
      cylinders: scopeByAbility(ability, "read", "Cylinder", "cylinders"),
      disposals: scopeByAbility(ability, "read", "Disposal", "d"),
    },
    jobVisible: (job) =>
      ability.can(
        "read",
        subject("Job", { organisationId: org, branchId: job.branchId, technicianId: job.technicianId, performedOn: job.performedOn }),
      ),
  });
});
