import { checkCertificationCoverage } from "../../classification/check-certification-coverage";
import { addDays } from "../../dates/local-date";
import { CERTIFICATION_TYPE_LABELS } from "../../vocabulary";
import type { AuditRule, RuleHit } from "../finding";
import { applianceWords, CIRCUIT_OPENING_KINDS, jobWords, safePressureClass, small, under608 } from "./rule-helpers";

export const technicianNotCertified: AuditRule = {
  id: "CT-CERT-01",
  title: "Technician not certified for the appliance",
  severity: "critical",
  pack: "us_federal",
  effectiveFrom: "1994-11-14",
  effectiveUntil: null,
  citation: "40 CFR 82.161(a)",
  explanation:
    "Only a technician holding a verified certification of the type that covers the appliance (Type I small appliances, Type II medium/high/very-high pressure, Type III low pressure, or Universal) may open it. Disposal of a small appliance needs no certification (82.155 governs it), and exempt substitutes such as carbon dioxide are outside the rule.",
  fix: "Reassign the work to a technician with a covering, verified certification, or verify the technician's card if they hold one.",
  check(_records, { index }) {
    const hits: RuleHit[] = [];
    for (const job of index.jobs) {
      if (!CIRCUIT_OPENING_KINDS.includes(job.kind) || job.applianceId === null) continue;
      const appliance = index.appliances.get(job.applianceId);
      if (!appliance || (!small(appliance) && safePressureClass(appliance) === null)) continue;
      // 82.154(a)(1): exempt substitutes are not refrigerants for subpart F.
      if (!under608(appliance)) continue;
      // Type I covers maintaining, servicing or repairing small appliances (82.161); their disposal is
      // governed by 82.155 (recovery, or the disposer's signed statement), not by certification.
      if (job.kind === "disposal" && small(appliance)) continue;
      if (job.technicianId === null) {
        hits.push({
          recordType: "job",
          recordId: job.id,
          on: job.performedOn,
          detail: `${jobWords(job)} on ${applianceWords(appliance)} names no technician, so certification cannot be shown`,
        });
        continue;
      }
      const tech = index.technicians.get(job.technicianId);
      if (!tech) continue; // reported by CT-REF-01
      const coverage = checkCertificationCoverage(tech.certifications, appliance);
      if (!coverage.allowed) {
        hits.push({
          recordType: "job",
          recordId: job.id,
          on: job.performedOn,
          detail: `${tech.name} worked on ${applianceWords(appliance)} (${jobWords(job)}): ${coverage.reason}`,
        });
      }
    }
    return hits;
  },
};

export const certificationUnverified: AuditRule = {
  id: "CT-CERT-02",
  title: "Certification card awaiting verification",
  severity: "minor",
  pack: "us_federal",
  effectiveFrom: "1994-11-14",
  effectiveUntil: null,
  citation: "40 CFR 82.161; copy of the certificate kept at the place of business",
  explanation:
    "A certification card that nobody has checked against the issuing program does not prove the technician is certified. A new card has the grace period set in the organisation's settings before it is reported.",
  fix: "Check the card with the certifying program and mark it verified or rejected.",
  check(records, { asOf, settings }) {
    const hits: RuleHit[] = [];
    const grace = settings.cardVerificationGraceDays;
    const seen = new Set<number>();
    for (const tech of records.technicians) {
      for (const cert of tech.certifications) {
        if (cert.state !== "pending" || seen.has(cert.id)) continue;
        seen.add(cert.id);
        // Organisation setting (no regulation sets a time): wait `grace` days after the card was added.
        const dueOn = cert.addedOn ? addDays(cert.addedOn, grace) : null;
        if (dueOn && asOf <= dueOn) continue;
        hits.push({
          recordType: "certification",
          recordId: cert.id,
          detail: `${tech.name}'s ${CERTIFICATION_TYPE_LABELS[cert.type]} card is awaiting verification${cert.addedOn ? `; added on ${cert.addedOn}, it was to be checked within ${grace} days (organisation setting)` : ""}`,
        });
      }
    }
    return hits;
  },
};
