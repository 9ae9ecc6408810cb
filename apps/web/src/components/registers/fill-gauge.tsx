import { formatMass, type MassDisplayUnit } from "@coldtrail/core";
import type { CylinderFill } from "@coldtrail/db";

/** The track runs to 125 % of the maximum so an overfill shows past the marker. */
/** Overfill is striped (a pattern, not only a colour). */
const OVER_STRIPES = "repeating-linear-gradient(135deg, var(--color-sev-critical) 0 5px, #ffffff 5px 8px)";
const TRACK_PERCENT = 125;

export type FillLevel = "empty" | "room" | "near" | "over";

export function fillLevel(netG: number, fill: CylinderFill | null): FillLevel {
  if (netG <= 0 || !fill) return "empty";
  if (fill.percent > 100) return "over";
  if (fill.percent >= 90) return "near";
  return "room";
}

const LEVEL_WORDS: Record<FillLevel, { icon: string; words: string; tone: string }> = {
  empty: { icon: "○", words: "Empty", tone: "text-ink-700" },
  room: { icon: "✓", words: "Within the maximum fill", tone: "text-ok" },
  near: { icon: "◑", words: "Close to the maximum: stop filling soon", tone: "text-sev-minor" },
  over: { icon: "⛔", words: "Over the maximum fill: do not add refrigerant", tone: "text-sev-critical" },
};

const BASIS_WORDS: Record<CylinderFill["basis"], string> = {
  sg_77f: "80 % of the water capacity × liquid density at 77 °F (AHRI Guideline K)",
  sg_130f: "80 % of the water capacity × liquid density at 130 °F (stricter setting)",
  given: "80 % of the water capacity × the given specific gravity",
  legacy_sg_1: "80 % of the water capacity (no catalogued density: water's density used)",
};

/**
 * How full a cylinder is against its maximum net fill (computed by the rules core). Never colour
 * alone: a sentence with an icon, a marker at the maximum and a striped band for any overfill.
 */
export function FillGauge({
  netG,
  fill,
  massUnit,
  size = "large",
}: {
  netG: number;
  fill: CylinderFill | null;
  massUnit: MassDisplayUnit;
  size?: "large" | "small";
}) {
  const level = fillLevel(netG, fill);
  const words = LEVEL_WORDS[level];
  const percent = fill ? Math.max(0, fill.percent) : 0;
  const shown = Math.min(percent, TRACK_PERCENT);
  const withinWidth = (Math.min(shown, 100) / TRACK_PERCENT) * 100;
  const overWidth = shown > 100 ? ((shown - 100) / TRACK_PERCENT) * 100 : 0;
  const markerLeft = (100 / TRACK_PERCENT) * 100;
  const percentText = fill ? `${Math.round(percent)} % of the maximum fill` : netG > 0 ? "Maximum unknown" : "Empty";
  const valueText = fill
    ? `${percentText}: ${formatMass(netG, massUnit)} of ${formatMass(fill.maxNetG, massUnit)} net. ${words.words}.`
    : netG > 0
      ? `${formatMass(netG, massUnit)} net; the maximum needs the refrigerant`
      : "Empty";

  if (size === "small") {
    return (
      <div className="min-w-32" data-testid="fill-gauge-small">
        <div
          role="meter"
          aria-label="Fill"
          aria-valuemin={0}
          aria-valuemax={Math.max(100, Math.round(percent))}
          aria-valuenow={Math.round(percent)}
          aria-valuetext={valueText}
          className="relative h-2.5 w-full overflow-hidden rounded-sm bg-ink-100"
        >
          <div className="absolute inset-y-0 left-0 bg-fjord-600" style={{ width: `${withinWidth}%` }} />
          {overWidth > 0 && (
            <div className="absolute inset-y-0" style={{ left: `${markerLeft}%`, width: `${overWidth}%`, backgroundImage: OVER_STRIPES }} />
          )}
          <div className="absolute inset-y-0 w-0.5 bg-ink-950" style={{ left: `${markerLeft}%` }} aria-hidden="true" />
        </div>
        <p className={`mt-0.5 text-xs font-medium ${words.tone}`}>
          <span aria-hidden="true">{words.icon} </span>
          {fill ? `${Math.round(percent)} % of max` : words.words}
          {level === "over" && " — over the maximum"}
        </p>
      </div>
    );
  }

  return (
    <section aria-labelledby="fill-h" className="rounded-lg border border-ink-200 bg-white p-4" data-testid="fill-gauge">
      <h2 id="fill-h" className="text-sm font-semibold uppercase tracking-wide text-ink-600">
        Fill
      </h2>
      <p className="mt-1 text-2xl font-semibold text-ink-950 tabular" data-testid="fill-percent">
        {percentText}
      </p>
      <p className={`mt-1 flex items-center gap-1.5 font-medium ${words.tone}`} data-testid="fill-state">
        <span aria-hidden="true">{words.icon}</span>
        {words.words}
      </p>
      <div className="relative mt-6">
        <span
          className="absolute -top-5 -translate-x-1/2 text-xs font-semibold text-ink-800"
          style={{ left: `${markerLeft}%` }}
          aria-hidden="true"
        >
          ▼ max
        </span>
        <div
          role="meter"
          aria-label="Cylinder fill"
          aria-valuemin={0}
          aria-valuemax={Math.max(100, Math.round(percent))}
          aria-valuenow={Math.round(percent)}
          aria-valuetext={valueText}
          className="relative h-6 w-full overflow-hidden rounded-md border border-ink-300 bg-ink-100"
        >
          <div className="absolute inset-y-0 left-0 bg-fjord-600" style={{ width: `${withinWidth}%` }} />
          {overWidth > 0 && (
            <div className="absolute inset-y-0" style={{ left: `${markerLeft}%`, width: `${overWidth}%`, backgroundImage: OVER_STRIPES }} />
          )}
          <div className="absolute inset-y-0 w-1 -translate-x-1/2 bg-ink-950" style={{ left: `${markerLeft}%` }} aria-hidden="true" />
        </div>
        <div className="relative mt-1 h-4 text-xs text-ink-600 tabular" aria-hidden="true">
          <span className="absolute left-0">0</span>
          {fill && (
            <span className="absolute -translate-x-1/2 whitespace-nowrap" style={{ left: `${markerLeft}%` }}>
              {formatMass(fill.maxNetG, massUnit)}
            </span>
          )}
        </div>
      </div>
      {fill && (
        <dl className="mt-3 grid gap-x-4 gap-y-1 text-sm sm:grid-cols-2">
          <div>
            <dt className="inline text-ink-600">Holds </dt>
            <dd className="inline font-medium tabular">
              {formatMass(netG, massUnit)} {fill.refrigerant}
            </dd>
          </div>
          <div>
            <dt className="inline text-ink-600">Maximum net </dt>
            <dd className="inline font-medium tabular">{formatMass(fill.maxNetG, massUnit)}</dd>
          </div>
          <div>
            <dt className="inline text-ink-600">Maximum on the scale </dt>
            <dd className="inline font-medium tabular">{formatMass(fill.maxGrossG, massUnit)}</dd>
          </div>
          <div>
            <dt className="inline text-ink-600">{fill.remainingG >= 0 ? "Room left " : "Over by "}</dt>
            <dd className={`inline font-medium tabular ${fill.remainingG < 0 ? "text-sev-critical" : ""}`}>
              {formatMass(Math.abs(fill.remainingG), massUnit)}
            </dd>
          </div>
          <p className="text-xs text-ink-600 sm:col-span-2">Maximum: {BASIS_WORDS[fill.basis]}.</p>
        </dl>
      )}
    </section>
  );
}
