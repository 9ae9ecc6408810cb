import type { LeakRateMethod } from "./leak-rate/leak-rate";

/** Organisation settings the rules read. Product choices, not regulation values, unless stated. */
export interface AuditSettings {
  ptTolerancePsi: number;
  massBalanceTolerancePercent: number;
  massBalanceToleranceG: number;
  requalificationYears: number;
  strictFill130F: boolean;
  leakRateMethod: LeakRateMethod;
  /** Days after a disposal before a missing or incomplete disposal record or statement is a finding. */
  disposalRecordGraceDays: number;
  /** Days after a certification card is added before "awaiting verification" is a finding. */
  cardVerificationGraceDays: number;
}

export const DEFAULT_SETTINGS: Readonly<AuditSettings> = Object.freeze({
  ptTolerancePsi: 5,
  massBalanceTolerancePercent: 2,
  massBalanceToleranceG: 454,
  requalificationYears: 5,
  strictFill130F: false,
  leakRateMethod: "annualizing",
  disposalRecordGraceDays: 14,
  cardVerificationGraceDays: 10,
});

/** One sentence per setting, for the settings screen and the README. */
export const SETTING_EXPLANATIONS: Readonly<Record<keyof AuditSettings, string>> = {
  ptTolerancePsi:
    "How far (psi) a settled cylinder's gauge may read above the refrigerant's saturation pressure before non-condensables are suspected; no regulation sets it, 3–5 psi is usual.",
  massBalanceTolerancePercent:
    "Share of the refrigerant taken in over the period (purchased plus recovered) that may go unaccounted before the mass balance is flagged.",
  massBalanceToleranceG:
    "Smallest unaccounted amount, in grams, that is ever flagged (454 g is 1 lb), so scale resolution on small volumes does not raise findings.",
  requalificationYears:
    "Years between recovery-cylinder requalification tests; 49 CFR 180.209 allows 5, 10 or 12 years by specification and 5 is the common marking.",
  strictFill130F:
    "When on, cylinder maximum fill uses the liquid density at 130 °F instead of 77 °F, which keeps blends such as R-410A well short of liquid-full on a hot day.",
  leakRateMethod:
    "The leak-rate method the company uses for all appliances (annualizing or rolling average); the rule requires one method applied consistently.",
  disposalRecordGraceDays:
    "Days a disposal record (appliances of more than 5 and less than 50 lb) or a small appliance's signed statement may follow the disposal before it is reported missing; 40 CFR 82.155 sets no deadline for writing them, so this is the company's own.",
  cardVerificationGraceDays:
    "Days a newly added certification card may wait for the check with its issuing program before it is reported as unverified; no regulation sets this, it is the time the company allows itself.",
};

export function resolveSettings(partial?: Partial<AuditSettings>): AuditSettings {
  return { ...DEFAULT_SETTINGS, ...(partial ?? {}) };
}
