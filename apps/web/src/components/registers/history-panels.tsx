import { APPLIANCE_CATEGORY_LABELS, REGISTER_LABELS, formatMass, type ApplianceCategory, type MassDisplayUnit } from "@coldtrail/core";

export interface AmendmentView {
  id: number;
  actorName: string;
  at: string;
  reason: string;
  previous: Record<string, unknown>;
  next: Record<string, unknown>;
  /** What was corrected when a panel mixes records (e.g. "Weighing of 2026-11-20"). */
  subjectLabel?: string;
}

export interface ActivityView {
  id: number;
  at: string;
  actorName: string | null;
  summary: string;
}

const COLUMN_WORDS: Record<string, string> = {
  tag: "Tag",
  description: "Description",
  category: "Kind of appliance",
  refrigerant: "Refrigerant",
  full_charge_g: "Full charge",
  full_charge_method: "Full charge determined by",
  factory_sealed: "Factory sealed",
  has_leak_detection: "Leak detection fitted",
  industrial_shutdown_needed: "Repair needs a shutdown",
  make_model: "Make and model",
  serial_number: "Serial number",
  manufactured_on: "Manufactured on",
  installed_on: "Installed on",
  site_id: "Site",
  status: "Status",
  retired_on: "Retired on",
  disposed_on: "Disposed of on",
  serial: "Serial",
  certification_state: "Certification",
  certified_by: "Certified by",
  small_appliance_only: "Small appliances only",
  system_dependent: "System-dependent",
  specification: "Specification",
  purpose: "Use",
  water_capacity_g: "Water capacity",
  tare_g: "Tare weight",
  last_requalified_on: "Last requalified on",
  weighed_on: "Weighed on",
  gross_g: "Scale reading",
  net_g: "Net contents",
  pressure_psig: "Pressure (psig)",
  temperature_c: "Temperature (°C)",
  notes: "Notes",
};

const STATUS_WORDS: Record<string, string> = {
  ...REGISTER_LABELS.applianceStatus,
  ...REGISTER_LABELS.cylinderStatus,
};

/** A stored value in plain words (grams in the branch's unit, yes/no, labels). */
export function describeValue(column: string, value: unknown, massUnit: MassDisplayUnit): string {
  if (value === null || value === undefined || value === "") return "—";
  if (column.endsWith("_g") && typeof value === "number") return formatMass(value, massUnit);
  if (
    typeof value === "boolean" ||
    ["factory_sealed", "has_leak_detection", "industrial_shutdown_needed", "small_appliance_only", "system_dependent"].includes(column)
  ) {
    return value === true || value === 1 || value === "1" ? "Yes" : "No";
  }
  if (column === "category") return APPLIANCE_CATEGORY_LABELS[value as ApplianceCategory] ?? String(value);
  if (column === "status") return STATUS_WORDS[String(value)] ?? String(value);
  if (column === "certification_state")
    return REGISTER_LABELS.equipmentCertification[value as keyof typeof REGISTER_LABELS.equipmentCertification] ?? String(value);
  if (column === "full_charge_method")
    return REGISTER_LABELS.fullChargeMethod[value as keyof typeof REGISTER_LABELS.fullChargeMethod] ?? String(value);
  if (column === "site_id") return `site #${String(value)}`;
  return String(value);
}

const when = (iso: string) => new Date(iso).toLocaleString("en-US", { dateStyle: "medium", timeStyle: "short", timeZone: "UTC" }) + " UTC";

/** Corrections of a regulated record: who, when, why, and each field's previous and new value. */
export function AmendmentsPanel({
  amendments,
  massUnit,
  title = "Corrections",
}: {
  amendments: AmendmentView[];
  massUnit: MassDisplayUnit;
  title?: string;
}) {
  return (
    <section aria-labelledby="amendments-h" className="rounded-lg border border-ink-200 bg-white p-4" data-testid="amendments">
      <h2 id="amendments-h" className="text-lg font-semibold text-ink-950">
        {title}
      </h2>
      {amendments.length === 0 ? (
        <p className="mt-1 text-sm text-ink-600">
          No corrections. Changes to regulated fields will be listed here with their previous values.
        </p>
      ) : (
        <ol className="mt-2 space-y-3">
          {amendments.map((a) => (
            <li key={a.id} className="border-l-4 border-fjord-200 pl-3" data-testid="amendment">
              <p className="text-sm text-ink-600">
                {when(a.at)} · {a.actorName}
                {a.subjectLabel && <> · {a.subjectLabel}</>}
              </p>
              <p className="text-sm">
                <span className="font-medium">Why:</span> {a.reason}
              </p>
              <ul className="mt-1 text-sm">
                {Object.keys(a.next).map((column) => (
                  <li key={column}>
                    <span className="font-medium">{COLUMN_WORDS[column] ?? column}:</span>{" "}
                    <span className="text-ink-600 line-through decoration-ink-400">
                      {describeValue(column, a.previous[column], massUnit)}
                    </span>{" "}
                    <span aria-label="changed to">→</span>{" "}
                    <span className="font-medium">{describeValue(column, a.next[column], massUnit)}</span>
                  </li>
                ))}
              </ul>
            </li>
          ))}
        </ol>
      )}
    </section>
  );
}

/** Every write on the record, newest first. */
export function ActivityPanel({ activity }: { activity: ActivityView[] }) {
  return (
    <section aria-labelledby="activity-h" className="rounded-lg border border-ink-200 bg-white p-4" data-testid="activity">
      <h2 id="activity-h" className="text-lg font-semibold text-ink-950">
        Activity
      </h2>
      {activity.length === 0 ? (
        <p className="mt-1 text-sm text-ink-600">Nothing recorded yet.</p>
      ) : (
        <ol className="mt-2 space-y-2 text-sm">
          {activity.map((a) => (
            <li key={a.id}>
              <span className="text-ink-600">
                {when(a.at)} · {a.actorName ?? "Coldtrail"}:
              </span>{" "}
              {a.summary}
            </li>
          ))}
        </ol>
      )}
    </section>
  );
}
