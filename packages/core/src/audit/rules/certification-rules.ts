import { checkCertificationCoverage } from "../../classification/check-certification-coverage";
import { CERTIFICATION_TYPE_LABELS } from "../../vocabulary";
import type { AuditRule, RuleHit } from "../finding";
import { applianceWords, CIRCUIT_OPENING_KINDS, jobWords, safePressureClass, small } from "./rule-helpers";

export const technicianNotCertified: AuditRule = {
  id: "CT-CERT-01",
  title: "Technician not certified for the appliance",
  severity: "critical",
  pack: "us_federal",
  effectiveFrom: "1994-11-14",
  effectiveUntil: null,
  citation: "40 CFR 82.161(a)",
  explanation:
    "Only a technician holding a verified certification of the type that covers the appliance (Type I small appliances, Type II medium/high/very-high pressure, Type III low pressure, or Universal) may open it.",
  fix: "Reassign the work to a technician with a covering, verified certification, or verify the technician's card if they hold one.",
  check(_records, { index }) {
    const hits: RuleHit[] = [];
    for (const job of index.jobs) {
      if (!CIRCUIT_OPENING_KINDS.includes(job.kind) || job.applianceId === null) continue;
      const appliance = index.appliances.get(job.applianceId);
      if (!appliance || (!small(appliance) && safePressureClass(appliance) === null)) continue;
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
  explanation: "A certification card that nobody has checked against the issuing program does not prove the technician is certified.",
  fix: "Check the card with the certifying program and mark it verified or rejected.",
  check(records) {
    const hits: RuleHit[] = [];
    for (const tech of records.technicians) {
      for (const cert of tech.certifications) {
        if (cert.state !== "pending") continue;
        hits.push({
          recordType: "certification",
          recordId: cert.id,
          detail: `${tech.name}'s ${CERTIFICATION_TYPE_LABELS[cert.type]} card is awaiting verification`,
        });
      }
    }
    return hits;
  },
};
