// Sign-ins and facts of the demo data (packages/db/README.md, "Demo data"), as the tests use them.
export const DEMO = {
  owner: "marguerite.halvorsen@kestrelmoor.example",
  officer: "teodora.vasquez-lind@kestrelmoor.example",
  managerColumbus: "grant.oyelaran@kestrelmoor.example",
  managerTucson: "lucia.baptiste-moreno@kestrelmoor.example",
  technicianColumbus: "marcus.delacroix-byrd@kestrelmoor.example",
  inspector: "harold.penwick@statewide-review.example",
  otherOrgManager: "wendell.ashgrove@quillfield-refrigeration.example",
  otherOrgTechnician: "paloma.quintero-dahl@quillfield-refrigeration.example",
  /** The only owner of the second organisation (admin specs change org 2, never org 1's settings or owner). */
  otherOrgOwner: "beatrix.holloway@quillfield-refrigeration.example",
  /** The inspector's active grant: Denver, records dated in 2025. */
  inspectorGrant: { branch: "Denver", from: "2025-01-01", to: "2025-12-31" },
} as const;

/**
 * The gaps planted in the demo data (packages/db/README.md, "Planted gaps") and how an audit reports
 * each: the rule id(s) that find it, the branch, and text that names its record (an appliance tag,
 * a cylinder serial or the branch) in the finding's record or appliance column.
 */
export const PLANTED_GAPS: ReadonlyArray<{ gap: string; ruleIds: readonly string[]; branch: string; record: string }> = [
  { gap: "G01", ruleIds: ["CT-CERT-01"], branch: "Columbus", record: "COL-RTU-901" },
  { gap: "G02", ruleIds: ["CT-CERT-01"], branch: "Tucson", record: "TUC-RES-902" },
  { gap: "G03", ruleIds: ["CT-DISP-02"], branch: "Denver", record: "DEN-SA-903" },
  { gap: "G04", ruleIds: ["CT-DISP-01"], branch: "Columbus", record: "COL-RES-904" },
  { gap: "G05", ruleIds: ["CT-CYL-01"], branch: "Tucson", record: "TUC-RTU-905" },
  { gap: "G06", ruleIds: ["CT-CYL-02"], branch: "Peoria", record: "PIA-C-906" },
  { gap: "G07", ruleIds: ["CT-CYL-03"], branch: "Columbus", record: "COL-RES-957" },
  { gap: "G08", ruleIds: ["CT-LEAK-01", "CT-LEAK-02"], branch: "Tucson", record: "TUC-RACK-908" },
  { gap: "G09", ruleIds: ["CT-LEAK-03"], branch: "Denver", record: "DEN-RACK-909" },
  { gap: "G10", ruleIds: ["CT-LEAK-04"], branch: "Peoria", record: "PIA-RACK-910" },
  { gap: "G11", ruleIds: ["CT-EVAC-01"], branch: "Columbus", record: "COL-CH-911" },
  { gap: "G12", ruleIds: ["CT-ACCESS-01"], branch: "Tucson", record: "TUC-SA-912" },
  { gap: "G13", ruleIds: ["CT-EVAC-03"], branch: "Denver", record: "DEN-SA-913" },
  { gap: "G14", ruleIds: ["CT-EQUIP-01"], branch: "Peoria", record: "PIA-RES-914" },
  { gap: "G15a", ruleIds: ["CT-REF-01"], branch: "Tucson", record: "TUC-RES-915" },
  { gap: "G15b", ruleIds: ["CT-REF-01"], branch: "Columbus", record: "COL-RES-925" },
  { gap: "G16", ruleIds: ["CT-BAL-01"], branch: "Peoria", record: "Branch Peoria" },
];

/** Register records of the demo data the register specs read (never change them). */
export const REGISTER_DEMO = {
  /** Demo gap G05: over its maximum fill (TUC). */
  overfilledCylinder: "TUC-C-905",
  /** Demo gap G06: past its requalification date (PIA). */
  overdueCylinder: "PIA-C-906",
  /** Demo gap G08: leak rate over the threshold, repair overdue (TUC). */
  leakingRack: "TUC-RACK-908",
  /** Demo gap G14: recovery unit not certified (PIA). */
  uncertifiedEquipment: "PIA-RE-914",
} as const;

/** Demo records the job, disposal, shipment and purchase specs work on (jobs engineer); they stay conforming. */
export const JOBS_DEMO = {
  /** A 447.6 kg R-448A supermarket rack (COL): a quarter-pound top-up stays far under every leak threshold. */
  chargeAppliance: "COL-RACK-101",
  /** A 410 kg R-134a chiller (COL), medium pressure and over 200 lb: 15 in Hg with post-1993 equipment. */
  mediumPressureChiller: "COL-CH-101",
} as const;
