import type { AdditionExclusion } from "../leak-rate/leak-rate";
import type {
  AccessMethod,
  ApplianceCategory,
  ApplianceStatus,
  CertificationState,
  CertificationType,
  EquipmentCertificationState,
  EvacuationUnit,
  FullChargeMethod,
  JobKind,
  MassDisplayUnit,
} from "../vocabulary";

/**
 * A branch's records as plain typed data, the input of the audit engine. Ids are numbers; masses are
 * integer grams; dates are ISO calendar dates in the branch's zone ("YYYY-MM-DD").
 */
export interface BranchRecords {
  branch: Branch;
  appliances: Appliance[];
  recoveryEquipment: RecoveryEquipment[];
  cylinders: Cylinder[];
  jobs: Job[];
  technicians: Technician[];
  disposalRecords: DisposalRecord[];
  disposalStatements: DisposalStatement[];
  reclaimShipments: ReclaimShipment[];
  purchases: RefrigerantPurchase[];
  stockCounts: StockCount[];
  /** Leak inspections and leak checks (US periodic inspections, EU leak checks). */
  leakInspections: LeakInspection[];
  chronicLeakReports: ChronicLeakReport[];
}

export interface Branch {
  id: number;
  name: string;
  /** IANA time zone, e.g. "America/Chicago". */
  timeZone: string;
  massUnit: MassDisplayUnit;
}

export interface Appliance {
  id: number;
  /** How people name it in the branch ("RTU-3, Elm St. store"). */
  label: string;
  category: ApplianceCategory;
  refrigerant: string;
  fullChargeG: number | null;
  fullChargeMethod: FullChargeMethod | null;
  /** Fully manufactured, charged and hermetically sealed in a factory. */
  factorySealed: boolean;
  status: ApplianceStatus;
  /** Date the status last changed (retired or disposed on). */
  statusChangedOn: string | null;
  location: string | null;
  installedOn: string | null;
  /** IPR whose repair needs an industrial-process shutdown (120-day repair window). */
  needsIndustrialShutdownForRepair?: boolean;
  /** Automatic leak detection / EU leak-detection system fitted. */
  hasLeakDetectionSystem?: boolean;
  /** EU: hermetically sealed and labelled as such. */
  hermeticallySealedLabelled?: boolean;
}

export type RecoveryEquipmentKind = "self_contained" | "system_dependent" | "small_appliance";

export interface RecoveryEquipment {
  id: number;
  serial: string;
  kind: RecoveryEquipmentKind;
  manufacturedOn: string | null;
  certification: EquipmentCertificationState;
}

export interface CylinderWeighing {
  id: number;
  on: string;
  grossG: number | null;
  temperatureF: number | null;
  pressurePsig: number | null;
}

export interface Cylinder {
  id: number;
  serial: string;
  waterCapacityG: number;
  tareG: number;
  lastRequalifiedOn: string | null;
  /** Overrides the organisation's requalification period for this cylinder. */
  requalificationYears: number | null;
  status: "in_service" | "retired";
  /** Contents before the first event in these records (an opening balance); null = empty. */
  openingContents: { refrigerant: string | null; netG: number } | null;
  weighings: CylinderWeighing[];
}

export interface RefrigerantMovement {
  /** "recovered": out of the appliance into a cylinder; "charged": into the appliance. */
  direction: "recovered" | "charged";
  amountG: number;
  /** Recovery cylinder filled or drawn from; null = none named (charged from virgin stock is fine). */
  cylinderId: number | null;
  /** Defaults to the job's refrigerant. */
  refrigerant?: string | null;
}

export interface Job {
  id: number;
  kind: JobKind;
  performedOn: string;
  technicianId: number | null;
  applianceId: number | null;
  equipmentId: number | null;
  refrigerant: string | null;
  movements: RefrigerantMovement[];
  /** Deepest level reached before opening or disposal. */
  evacuation: { value: number; unit: EvacuationUnit } | null;
  accessMethod: AccessMethod | null;
  temporaryAccessRemoved: boolean | null;
  compressorOperating: boolean | null;
  /** Charges not counted in the leak rate. */
  additionExclusion: AdditionExclusion | null;
  /** Charges: the earlier job whose leak this addition also tops up (summed into one leak event). */
  sameLeakAsJobId?: number | null;
  /** verification_test jobs only. */
  verification: { stage: "initial" | "follow_up"; passed: boolean } | null;
}

export interface Certification {
  id: number;
  type: CertificationType;
  state: CertificationState;
  /** Calendar date the card was added (branch zone); the verification grace period runs from it. */
  addedOn?: string | null;
}

export interface Technician {
  id: number;
  name: string;
  certifications: Certification[];
}

/** 40 CFR 82.155(c) disposal record (appliances of more than 5 and less than 50 lb). */
export interface DisposalRecord {
  id: number;
  applianceId: number;
  companyName: string | null;
  applianceLocation: string | null;
  recoveredOn: string | null;
  refrigerant: string | null;
  recoveredG: number | null;
}

/** 40 CFR 82.155(b) signed statement for a small appliance (or a contract reference instead). */
export interface DisposalStatement {
  id: number;
  applianceId: number;
  signedBy: string | null;
  signedOn: string | null;
  recoveredByName: string | null;
  recoveredByAddress: string | null;
  recoveredOn: string | null;
  contractReference: string | null;
}

export interface ReclaimShipment {
  id: number;
  shippedOn: string;
  reclaimer: string | null;
  lines: { cylinderId: number | null; refrigerant: string; amountG: number }[];
}

export interface RefrigerantPurchase {
  id: number;
  on: string;
  refrigerant: string;
  amountG: number;
}

/** Refrigerant held by the branch on a date (stock-take, all containers). */
export interface StockCount {
  id: number;
  on: string;
  refrigerant: string;
  netG: number;
}

export interface LeakInspection {
  id: number;
  applianceId: number;
  on: string;
}

export interface ChronicLeakReport {
  id: number;
  applianceId: number;
  calendarYear: number;
  submittedOn: string;
}
