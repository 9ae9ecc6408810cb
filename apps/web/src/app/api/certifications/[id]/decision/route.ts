import { certificationDecisionInput, describeCertificationDecision } from "@coldtrail/core";
import { decideCertification, markNotificationEmailed } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { appLink, mailHtml, sendMail } from "@/lib/server/mail";
import { cardFor } from "../../_lib/card-access";

/**
 * The compliance officer verifies a card, or does not accept it with a reason. The technician is
 * told in the app (written with the decision) and by e-mail (sent after it; a mail failure does not
 * undo the decision and is reported back).
 */
export const POST = route<undefined, typeof certificationDecisionInput, { id: string }>(
  { can: ["verify", "Certification"], body: certificationDecisionInput },
  async ({ actor, ability, db, params, body }) => {
    const ref = await cardFor(db, actor, ability, params.id, "verify");
    const result = await decideCertification(db, {
      actor: { userId: actor.userId, organisationId: actor.organisationId },
      id: ref.id,
      input: body,
    });
    const words = describeCertificationDecision(result);
    let emailed = false;
    try {
      const link = appLink(`/certifications/${ref.id}`);
      await sendMail({
        to: result.holder.email,
        subject: words.subject,
        text: [`Hello ${result.holder.name},`, "", ...words.paragraphs, "", `Open the card in Coldtrail: ${link}`].join("\n"),
        html: mailHtml({
          heading: words.heading,
          paragraphs: [`Hello ${result.holder.name},`, ...words.paragraphs],
          action: { label: "Open the card", href: link },
        }),
      });
      await markNotificationEmailed(db, { id: result.notificationId });
      emailed = true;
    } catch (err) {
      console.error("certification decision e-mail could not be sent", err);
    }
    return { id: ref.id, state: result.state, emailed };
  },
);
