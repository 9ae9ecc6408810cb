import type { AccessMethod, ApplianceCategory, EvacuationUnit, JobKind, MassDisplayUnit } from "@coldtrail/core";

/** The shapes the API routes return, as the browser sees them. */
export interface JobListRow {
  id: number;
  kind: JobKind;
  performedOn: string;
  branchId: number;
  branchName: string;
  branchMassUnit: MassDisplayUnit;
  applianceId: number | null;
  applianceTag: string | null;
  applianceDescription: string | null;
  applianceCategory: ApplianceCategory | null;
  technicianId: number;
  technicianName: string;
  refrigerant: string | null;
  massG: number | null;
  cylinderSerial: string | null;
  equipmentSerial: string | null;
}

export interface JobListPage {
  rows: JobListRow[];
  total: number;
  page: number;
  pageSize: number;
}

export interface JobDetail extends JobListRow {
  accessMethod: AccessMethod | null;
  temporaryAccessRemoved: boolean | null;
  evacuationValue: number | null;
  evacuationUnit: EvacuationUnit | null;
  compressorOperating: boolean | null;
  notes: string | null;
  createdAt: string;
}

export interface BranchOption {
  id: number;
  name: string;
  massUnit: MassDisplayUnit;
  timeZone: string;
}

export interface ApplianceOption {
  id: number;
  branchId: number;
  branchName: string;
  massUnit: MassDisplayUnit;
  timeZone: string;
  tag: string;
  description: string | null;
  siteName: string | null;
  category: ApplianceCategory;
  refrigerant: string;
  fullChargeG: number | null;
}

export interface CylinderOption {
  id: number;
  serial: string;
  refrigerant: string | null;
  contentsG: number;
  waterCapacityG: number;
  tareG: number;
}

export interface EquipmentOption {
  id: number;
  serial: string;
  makeModel: string | null;
  certificationState: string;
}
