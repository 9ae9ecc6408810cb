import { certificationDecisionInput, describeCertificationDecision } from "@coldtrail/core";
import { decideCertification, writeTransaction } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { appLink, mailHtml, queueOutgoingMail } from "@/lib/server/mail";
import { kickTaskRunner } from "@/lib/server/task-kick";
import { cardFor } from "../../_lib/card-access";

/**
 * The compliance officer verifies a card, or does not accept it with a reason. The technician is
 * told in the app and by e-mail, both written with the decision (the mail through the outbox).
 */
export const POST = route<undefined, typeof certificationDecisionInput, { id: string }>(
  { can: ["verify", "Certification"], body: certificationDecisionInput },
  async ({ actor, ability, db, params, body }) => {
    const ref = await cardFor(db, actor, ability, params.id, "verify");
    // The decision, its in-app notice and the outbox mail commit together; the runner sends the mail.
    const result = await writeTransaction(db, async (trx) => {
      const decided = await decideCertification(trx, {
        actor: { userId: actor.userId, organisationId: actor.organisationId },
        id: ref.id,
        input: body,
      });
      const words = describeCertificationDecision(decided);
      const link = appLink(`/certifications/${ref.id}`);
      await queueOutgoingMail(trx, {
        organisationId: actor.organisationId,
        notificationId: decided.notificationId,
        to: decided.holder.email,
        subject: words.subject,
        text: [`Hello ${decided.holder.name},`, "", ...words.paragraphs, "", `Open the card in Coldtrail: ${link}`].join("\n"),
        html: mailHtml({
          heading: words.heading,
          paragraphs: [`Hello ${decided.holder.name},`, ...words.paragraphs],
          action: { label: "Open the card", href: link },
        }),
      });
      return decided;
    });
    kickTaskRunner();
    const emailed = true; // queued; delivered by the runner, retried while the mail server is down
    return { id: ref.id, state: result.state, emailed };
  },
);
