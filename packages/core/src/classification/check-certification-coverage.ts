import { normaliseDesignation } from "../refrigerants/normalise-designation";
import { CERTIFICATION_TYPE_LABELS, type CertificationState, type CertificationType } from "../vocabulary";
import {
  certificationClass,
  CERTIFICATION_COVERAGE,
  type ApplianceCertificationClass,
  type ApplianceForClassification,
} from "./appliance-classification";

export interface CertificationHeld {
  type: CertificationType;
  state: CertificationState;
}

export interface CertificationCoverage {
  allowed: boolean;
  /** Plain-words reason, e.g. "Type II or Universal is needed for a high-pressure appliance (R-410A)". */
  reason: string;
  applianceClass: ApplianceCertificationClass;
  requiredTypes: readonly CertificationType[];
  /** The verified certification that covers the work, if any. */
  coveredBy: CertificationType | null;
  /** Covering types the technician holds but that are not verified yet. */
  pendingCovering: CertificationType[];
}

const CLASS_WORDS: Record<ApplianceCertificationClass, string> = {
  small_appliance: "a small appliance",
  low: "a low-pressure appliance",
  medium: "a medium-pressure appliance",
  high: "a high-pressure appliance",
  very_high: "a very-high-pressure appliance",
};

const list = (types: readonly CertificationType[]) => types.map((t) => CERTIFICATION_TYPE_LABELS[t]).join(" or ");

/**
 * Whether a technician's certifications allow work on an appliance (40 CFR 82.161). Only verified
 * cards count; a pending card is reported but does not allow the work; rejected cards are ignored.
 */
export function checkCertificationCoverage(
  certs: readonly CertificationHeld[],
  appliance: ApplianceForClassification,
): CertificationCoverage {
  const applianceClass = certificationClass(appliance);
  const requiredTypes = CERTIFICATION_COVERAGE[applianceClass];
  const what = `${CLASS_WORDS[applianceClass]} (${normaliseDesignation(appliance.refrigerant)})`;
  const verified = certs.filter((c) => c.state === "verified").map((c) => c.type);
  const coveredBy = requiredTypes.find((t) => verified.includes(t)) ?? null;
  const pendingCovering = requiredTypes.filter((t) => !verified.includes(t) && certs.some((c) => c.type === t && c.state === "pending"));
  if (coveredBy) {
    return {
      allowed: true,
      reason: `${CERTIFICATION_TYPE_LABELS[coveredBy]} (verified) covers ${what}`,
      applianceClass,
      requiredTypes,
      coveredBy,
      pendingCovering,
    };
  }
  const held = verified.length ? `holds ${list([...new Set(verified)].sort())} (verified)` : "holds no verified certification";
  const pending = pendingCovering.length ? `; ${list(pendingCovering)} is awaiting verification` : "";
  return {
    allowed: false,
    reason: `${list(requiredTypes)} is needed for ${what}; the technician ${held}${pending}`,
    applianceClass,
    requiredTypes,
    coveredBy: null,
    pendingCovering,
  };
}
