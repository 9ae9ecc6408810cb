import { z } from "zod";
import { text } from "./text";
import { calendarDate } from "./calendar-date";
import {
  CERTIFICATION_STATES,
  CERTIFICATION_TYPES,
  CERTIFICATION_TYPE_LABELS,
  type CertificationState,
  type CertificationType,
} from "../vocabulary";

/**
 * Inputs of technicians' certification cards: the upload (a multipart form: the card file plus
 * these fields), the officer's decision, corrections (amendments) and the lists. Shared by the
 * API routes and the forms.
 */

/** Words and icons for a card's state: never colour alone. */
export const CERTIFICATION_STATE_LABELS: Record<CertificationState, string> = {
  pending: "Awaiting verification",
  verified: "Verified",
  rejected: "Not accepted",
};
export const CERTIFICATION_STATE_ICONS: Record<CertificationState, string> = {
  pending: "◷",
  verified: "✓",
  rejected: "✕",
};

const isoDate = calendarDate("Use a date like 2016-04-12");
const isRealDate = (s: string) => {
  const d = new Date(`${s}T00:00:00Z`);
  return !Number.isNaN(d.getTime()) && d.toISOString().slice(0, 10) === s;
};
const blankToUndefined = (v: unknown) => (v === "" || v === null || (typeof v === "string" && v.trim() === "") ? undefined : v);
/** One day of slack: a person's calendar date may be ahead of UTC. */
const latestDate = () => new Date(Date.now() + 24 * 3600 * 1000).toISOString().slice(0, 10);

/** Type checkboxes arrive as one value or many; "Universal" already covers I, II and III. */
const certificationTypesField = z.preprocess(
  (v): unknown[] => (v === undefined || v === null || v === "" ? [] : Array.isArray(v) ? (v as unknown[]) : [v]),
  z
    .array(z.enum(CERTIFICATION_TYPES, { error: "Choose Type I, Type II, Type III or Universal" }), {
      error: "Choose the certification type(s)",
    })
    .min(1, "Choose at least one certification type")
    .transform((types): CertificationType[] => (types.includes("universal") ? ["universal"] : [...new Set(types)].sort())),
);

const certifyingOrganisationField = text({ error: "Enter the organisation that issued the certificate" })
  .trim()
  .min(2, "Enter the organisation that issued the certificate")
  .max(200, "Limited to 200 characters");

const certificateNumberField = text({ error: "Enter the certificate number printed on the card" })
  .trim()
  .min(1, "Enter the certificate number printed on the card")
  .max(100, "Limited to 100 characters")
  .regex(/^[\p{L}\p{N}][\p{L}\p{N} ./#-]*$/u, "Use the letters, digits, spaces, dots, dashes and slashes printed on the card");

const issuedOnField = z.preprocess(
  blankToUndefined,
  isoDate
    .refine(isRealDate, "That is not a real calendar date")
    .refine((d) => d <= latestDate(), "The issue date cannot be in the future")
    .refine((d) => d >= "1993-01-01", "Section 608 certificates were first issued in 1993; check the year")
    .optional(),
);

/** The fields sent with a card upload (POST /api/certifications, multipart; the file is the `card` part). */
export const certificationCardInput = z.object({
  types: certificationTypesField,
  certifyingOrganisation: certifyingOrganisationField,
  certificateNumber: certificateNumberField,
  issuedOn: issuedOnField,
});
export type CertificationCardInput = z.output<typeof certificationCardInput>;

const reasonText = (missing: string) => text({ error: missing }).trim().min(5, missing).max(1000, "Limited to 1,000 characters");

/** The compliance officer's decision on a card awaiting verification. */
export const certificationDecisionInput = z.discriminatedUnion(
  "decision",
  [
    z.object({
      decision: z.literal("verify"),
      note: z.preprocess(blankToUndefined, text().trim().max(1000, "Limited to 1,000 characters").optional()),
    }),
    z.object({
      decision: z.literal("reject"),
      reason: reasonText("Tell the technician why the card is not accepted (at least a few words)"),
    }),
  ],
  { error: "Choose to verify or not accept the card" },
);
export type CertificationDecisionInput = z.output<typeof certificationDecisionInput>;

/** A correction of a card's details: only what changes, and why (kept as an amendment). */
export const certificationCorrectionInput = z
  .object({
    reason: text({ error: "Say why the record is being corrected" })
      .trim()
      .min(3, "Say why the record is being corrected")
      .max(1000, "Limited to 1,000 characters"),
    types: certificationTypesField.optional(),
    certifyingOrganisation: certifyingOrganisationField.optional(),
    certificateNumber: certificateNumberField.optional(),
    issuedOn: z.preprocess(
      (v) => (v === "" ? null : v),
      isoDate.refine(isRealDate, "That is not a real calendar date").nullable().optional(),
    ),
  })
  .superRefine((value, ctx) => {
    const { reason: _reason, ...changes } = value;
    if (Object.values(changes).every((v) => v === undefined))
      ctx.addIssue({ code: "custom", path: ["reason"], message: "Change at least one detail" });
    if (value.issuedOn && value.issuedOn > latestDate())
      ctx.addIssue({ code: "custom", path: ["issuedOn"], message: "The issue date cannot be in the future" });
  });
export type CertificationCorrectionInput = z.output<typeof certificationCorrectionInput>;

/** Why a card is withdrawn (voided as entered in error). */
export const certificationWithdrawInput = z.object({
  reason: text({ error: "Say why the card is being withdrawn" })
    .trim()
    .min(3, "Say why the card is being withdrawn")
    .max(1000, "Limited to 1,000 characters"),
});
export type CertificationWithdrawInput = z.output<typeof certificationWithdrawInput>;

export const CERTIFICATION_SORT_FIELDS = ["uploadedAt", "technician", "state", "certifyingOrganisation", "decidedAt"] as const;

/** Query string of GET /api/certifications (the officer's queue, a manager's view, a technician's own cards). */
export const certificationListQuery = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
  sort: z.enum(CERTIFICATION_SORT_FIELDS).default("uploadedAt"),
  dir: z.enum(["asc", "desc"]).default("asc"),
  state: z.preprocess(blankToUndefined, z.enum(CERTIFICATION_STATES).optional()),
  /** Only the signed-in person's own cards. */
  mine: z.preprocess((v) => v === "1" || v === "true" || v === true, z.boolean()).default(false),
  branchId: z.preprocess(blankToUndefined, z.coerce.number().int().positive().optional()),
  /** Technician name or e-mail, certificate number or certifying organisation. */
  q: z.preprocess(blankToUndefined, text().trim().max(100).optional()),
});
export type CertificationListQuery = z.output<typeof certificationListQuery>;

/** Query string of GET /api/notifications. */
export const notificationListQuery = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(50).default(10),
  unread: z.preprocess((v) => v === "1" || v === "true" || v === true, z.boolean()).default(false),
});
export type NotificationListQuery = z.output<typeof notificationListQuery>;

/** POST /api/notifications/read: some notifications, or all of them. */
export const notificationReadInput = z.union([
  z.object({ ids: z.array(z.number().int().positive()).min(1).max(200) }),
  z.object({ all: z.literal(true) }),
]);
export type NotificationReadInput = z.output<typeof notificationReadInput>;

/** The largest card file accepted (photo or PDF). */
export const CERTIFICATION_CARD_MAX_BYTES = 10 * 1024 * 1024;

/**
 * A client-supplied file name is never used as a storage key, but one that looks like a path (or
 * hides control characters) is refused outright: it usually means a crafted request.
 */
export function isPathLikeFileName(name: string): boolean {
  // eslint-disable-next-line no-control-regex -- control characters are what this check refuses
  return /[\\/\u0000-\u001f\u007f]/.test(name) || name.includes("..") || /^[a-z]:/i.test(name) || name.trim() === "";
}

/** The words of the message that tells a technician about the decision on their card (e-mail). */
export function describeCertificationDecision(d: {
  state: CertificationState;
  types: CertificationType[];
  certifyingOrganisation: string;
  certificateNumber: string;
  reason: string | null;
}): { subject: string; heading: string; paragraphs: string[] } {
  const order: CertificationType[] = ["type_i", "type_ii", "type_iii", "universal"];
  const types = [...d.types]
    .sort((a, b) => order.indexOf(a) - order.indexOf(b))
    .map((t) => CERTIFICATION_TYPE_LABELS[t])
    .join(" + ");
  const card = `${types} certification card (${d.certifyingOrganisation}, no. ${d.certificateNumber})`;
  if (d.state === "verified") {
    return {
      subject: `Your ${types} certification card is verified`,
      heading: "Your certification card is verified",
      paragraphs: [`Your ${card} has been checked and verified.`, "It now counts for the appliances you work on."],
    };
  }
  return {
    subject: `Your ${types} certification card was not accepted`,
    heading: "Your certification card was not accepted",
    paragraphs: [
      `Your ${card} could not be verified.`,
      `Reason: ${d.reason ?? "no reason given"}`,
      "Please upload a new photo or PDF of the card in Coldtrail.",
    ],
  };
}
