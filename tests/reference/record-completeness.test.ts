import { describe, expect, it } from "vitest";
import {
  disposalRecordCompleteness,
  serviceRecordCompleteness,
  smallApplianceStatementCompleteness,
  type Appliance,
  type Job,
} from "@coldtrail/core";

describe("disposal record for appliances of 5–50 lb (40 CFR 82.155(c); REFERENCE.md §4)", () => {
  const full = {
    id: 1,
    applianceId: 1,
    companyName: "Northwind Cooling",
    applianceLocation: "12 Birch Rd",
    recoveredOn: "2026-02-01",
    refrigerant: "R-410A",
    recoveredG: 9000,
  };
  it("is complete with company, location, date, type and quantity", () => {
    expect(disposalRecordCompleteness(full)).toEqual({ complete: true, missing: [] }); // Source: REFERENCE.md §4 (82.155(c)(1)–(2)); exact field list from memory
  });
  it("lists what is missing", () => {
    expect(disposalRecordCompleteness({ ...full, applianceLocation: " ", recoveredG: null }).missing).toEqual([
      "location of the appliance",
      "quantity recovered",
    ]); // Source: REFERENCE.md §4
  });
});

describe("small-appliance disposal statement (40 CFR 82.155(b); REFERENCE.md §4)", () => {
  const blank = {
    id: 1,
    applianceId: 1,
    signedBy: null,
    signedOn: null,
    recoveredByName: null,
    recoveredByAddress: null,
    recoveredOn: null,
    contractReference: null,
  };
  it("needs a signature plus the recoverer's name, address and the date", () => {
    expect(smallApplianceStatementCompleteness(blank).missing).toEqual([
      "signature",
      "date signed",
      "name of the person who recovered the refrigerant",
      "address of the person who recovered the refrigerant",
      "date of recovery",
    ]); // Source: EPA safe-disposal brochure as quoted [S27]
  });
  it("or a contract saying the refrigerant is removed before delivery", () => {
    expect(smallApplianceStatementCompleteness({ ...blank, contractReference: "C-2026-04" }).complete).toBe(true); // Source: [S27]
  });
});

describe("service record on a covered appliance (82.157(b), (l)(2); REFERENCE.md §4)", () => {
  const appliance: Appliance = {
    id: 1,
    label: "Walk-in freezer 2",
    category: "commercial_refrigeration",
    refrigerant: "R-404A",
    fullChargeG: 40_000,
    fullChargeMethod: "nameplate",
    factorySealed: false,
    status: "in_service",
    statusChangedOn: null,
    location: "Store 14, back room",
    installedOn: "2019-05-01",
  };
  const job: Job = {
    id: 7,
    kind: "charge",
    performedOn: "2026-02-02",
    technicianId: 1,
    applianceId: 1,
    equipmentId: null,
    refrigerant: "R-404A",
    movements: [{ direction: "charged", amountG: 1200, cylinderId: null }],
    evacuation: null,
    accessMethod: "service_valve",
    temporaryAccessRemoved: null,
    compressorOperating: null,
    additionExclusion: null,
    verification: null,
  };
  it("is complete with identity, location, date, service, amount and type, full charge", () => {
    expect(serviceRecordCompleteness(job, appliance).complete).toBe(true); // Source: REFERENCE.md §4 (field list from memory)
  });
  it("lists the missing location, amount and full charge", () => {
    expect(serviceRecordCompleteness({ ...job, movements: [] }, { ...appliance, location: null, fullChargeG: null }).missing).toEqual([
      "appliance location",
      "amount added or removed",
      "full charge",
    ]); // Source: REFERENCE.md §4
  });
});
