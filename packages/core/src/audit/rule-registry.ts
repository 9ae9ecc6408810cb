import type { AuditRule } from "./finding";
import { certificationUnverified, technicianNotCertified } from "./rules/certification-rules";
import {
  cylinderMixedRefrigerants,
  cylinderNonCondensables,
  cylinderOverfilled,
  cylinderPastRequalification,
} from "./rules/cylinder-rules";
import { disposalRecordMissing, disposalWithoutRecovery, smallApplianceStatementMissing } from "./rules/disposal-rules";
import { euLeakCheckOverdue, euLeakDetectionMissing } from "./rules/eu-rules";
import {
  equipmentNotCertified,
  evacuationNotReached,
  evacuationNotRecorded,
  smallApplianceRecoveryShort,
  systemDependentOnLargeAppliance,
  temporaryAccessLeftInPlace,
} from "./rules/evacuation-rules";
import {
  chronicLeakerNotReported,
  leakAwaitingRepair,
  leakRateChargeUnknown,
  leakRepairOverdue,
  periodicInspectionOverdue,
  verificationTestMissing,
} from "./rules/leak-rules";
import { massBalanceUnaccounted, missingRegisterReference, serviceRecordIncomplete } from "./rules/register-rules";

/**
 * Every audit rule, sorted by id. Ids are ours, stable and never reused:
 * CT-<area>-<nn>, area one of ACCESS, BAL, CERT, CYL, DISP, EQUIP, EU, EVAC, LEAK, REC, REF.
 */
export const RULES: readonly AuditRule[] = Object.freeze(
  [
    technicianNotCertified,
    certificationUnverified,
    evacuationNotReached,
    evacuationNotRecorded,
    smallApplianceRecoveryShort,
    temporaryAccessLeftInPlace,
    equipmentNotCertified,
    systemDependentOnLargeAppliance,
    leakAwaitingRepair,
    leakRepairOverdue,
    verificationTestMissing,
    chronicLeakerNotReported,
    periodicInspectionOverdue,
    leakRateChargeUnknown,
    cylinderOverfilled,
    cylinderPastRequalification,
    cylinderMixedRefrigerants,
    cylinderNonCondensables,
    disposalRecordMissing,
    smallApplianceStatementMissing,
    disposalWithoutRecovery,
    massBalanceUnaccounted,
    missingRegisterReference,
    serviceRecordIncomplete,
    euLeakCheckOverdue,
    euLeakDetectionMissing,
  ].sort((a, b) => (a.id < b.id ? -1 : 1)),
);

const BY_ID = new Map(RULES.map((r) => [r.id, r]));

export function getRule(id: string): AuditRule | undefined {
  return BY_ID.get(id);
}
