"use client";

import { CartesianGrid, Line, LineChart, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import { formatMass, type MassDisplayUnit } from "@coldtrail/core";
import type { LeakChartEvent } from "@coldtrail/db";

interface Point {
  /** The addition date as a UTC timestamp, so the axis is to scale in time. */
  t: number;
  on: string;
  percent: number | null;
  threshold: number | null;
  exceeds: boolean;
}

/** Over the threshold: a triangle with a bar (shape, not only colour); otherwise a round dot. */
function EventDot(props: { cx?: number; cy?: number; payload?: Point; index?: number }) {
  const { cx, cy, payload } = props;
  if (cx === undefined || cy === undefined || payload?.percent === null || payload?.percent === undefined) return <g key={props.index} />;
  if (payload.exceeds) {
    return (
      <g key={props.index}>
        <path
          d={`M ${cx} ${cy - 8} L ${cx + 7} ${cy + 5} L ${cx - 7} ${cy + 5} Z`}
          fill="var(--color-sev-critical)"
          stroke="#fff"
          strokeWidth={1}
        />
        <line x1={cx} x2={cx} y1={cy - 4} y2={cy + 1} stroke="#fff" strokeWidth={1.5} />
      </g>
    );
  }
  return <circle key={props.index} cx={cx} cy={cy} r={4.5} fill="var(--color-fjord-600)" stroke="#fff" strokeWidth={1} />;
}

const pct = (n: number | null) => (n === null ? "—" : `${n.toFixed(1)} %`);

/**
 * Leak rate at every addition of refrigerant (computed by the rules core), with the trigger rate in
 * force as a dashed, labelled line. Readable without colour: over-threshold points are triangles, the
 * threshold is dashed, and the same figures follow in a table.
 */
/** The annualizing interval in words: days and what they run from. */
function intervalWords(e: LeakChartEvent): string {
  const days = e.daysSinceLastAddition;
  if (days === null) return "none before (365 used)";
  const capped = days > 365 ? " (365 used)" : "";
  if (e.intervalStartsFrom === "installation") return `${days} since installation${capped}`;
  return `${days}${capped}`;
}

export function LeakRateChart({
  events,
  massUnit,
  method,
}: {
  events: LeakChartEvent[];
  massUnit: MassDisplayUnit;
  method: "annualizing" | "rolling_average";
}) {
  const points: Point[] = events.map((e) => ({
    t: Date.parse(`${e.on}T00:00:00Z`),
    on: e.on,
    percent: e.percent === null ? null : Math.round(e.percent * 10) / 10,
    threshold: e.threshold,
    exceeds: e.exceeds,
  }));
  const lastThreshold = [...events].reverse().find((e) => e.threshold !== null)?.threshold ?? null;
  const thresholds = new Set(events.map((e) => e.threshold).filter((x): x is number => x !== null));
  const DAY = 86_400_000;
  const first = points[0]?.t ?? 0;
  const last = points[points.length - 1]?.t ?? 0;
  const pad = Math.max(20 * DAY, (last - first) * 0.06);
  const isoDay = (ms: number) => new Date(ms).toISOString().slice(0, 10);
  const over = events.filter((e) => e.exceeds).length;
  const maxPercent = Math.max(0, ...points.map((p) => p.percent ?? 0), ...points.map((p) => p.threshold ?? 0));
  const summary =
    events.length === 0
      ? "No refrigerant has been added to this appliance."
      : `${events.length} addition${events.length === 1 ? "" : "s"} charted; ${over} over the threshold${lastThreshold !== null ? ` (trigger rate ${lastThreshold} %)` : ""}; highest leak rate ${pct(Math.max(...points.map((p) => p.percent ?? 0)))}.`;

  return (
    <section aria-labelledby="leak-h" className="rounded-lg border border-ink-200 bg-white p-4" data-testid="leak-chart">
      <h2 id="leak-h" className="text-lg font-semibold text-ink-950">
        Leak-rate history
      </h2>
      <p className="text-sm text-ink-600">
        {method === "annualizing" ? "Annualizing method" : "Rolling-average method"} (40 CFR 82.152), computed at every addition. {summary}
      </p>
      {events.length > 0 && (
        <>
          <div className="mt-3 h-72 w-full" role="img" aria-label={`Leak-rate chart. ${summary}`}>
            <ResponsiveContainer width="100%" height="100%">
              <LineChart data={points} margin={{ top: 20, right: 24, bottom: 36, left: 8 }}>
                <CartesianGrid stroke="var(--color-ink-200)" strokeDasharray="2 4" />
                <XAxis
                  dataKey="t"
                  type="number"
                  scale="time"
                  domain={[first - pad, last + pad]}
                  tickFormatter={isoDay}
                  tick={{ fontSize: 12, fill: "var(--color-ink-700)" }}
                  label={{ value: "Date of addition", position: "insideBottom", offset: -24, fill: "var(--color-ink-700)", fontSize: 12 }}
                />
                <YAxis
                  domain={[0, Math.ceil((maxPercent * 1.15) / 5) * 5 || 10]}
                  tick={{ fontSize: 12, fill: "var(--color-ink-700)" }}
                  unit=" %"
                  width={56}
                  label={{
                    value: "Leak rate (%)",
                    angle: -90,
                    position: "insideLeft",
                    offset: 4,
                    fill: "var(--color-ink-700)",
                    fontSize: 12,
                    style: { textAnchor: "middle" },
                  }}
                />
                <Tooltip
                  labelFormatter={(v) => (typeof v === "number" ? isoDay(v) : String(v))}
                  formatter={(value, name) => [typeof value === "number" ? `${value.toFixed(1)} %` : String(value), name]}
                />
                <Line
                  name="Leak rate"
                  type="linear"
                  dataKey="percent"
                  stroke="var(--color-fjord-600)"
                  strokeWidth={2}
                  dot={(p: object) => <EventDot {...p} />}
                  isAnimationActive={false}
                  connectNulls
                />
                {thresholds.size > 1 && (
                  <Line
                    name="Threshold (trigger rate)"
                    type="stepAfter"
                    dataKey="threshold"
                    stroke="var(--color-ink-900)"
                    strokeDasharray="7 5"
                    strokeWidth={1.5}
                    dot={false}
                    isAnimationActive={false}
                  />
                )}
                {lastThreshold !== null && (
                  <ReferenceLine
                    y={lastThreshold}
                    stroke={thresholds.size > 1 ? "transparent" : "var(--color-ink-900)"}
                    strokeDasharray="7 5"
                    strokeWidth={1.5}
                    label={{
                      value: `Threshold ${lastThreshold} %`,
                      position: "insideTopRight",
                      fill: "var(--color-ink-900)",
                      fontSize: 12,
                    }}
                  />
                )}
              </LineChart>
            </ResponsiveContainer>
          </div>
          <p className="mt-1 flex flex-wrap gap-x-4 text-xs text-ink-600" aria-hidden="true">
            <span>● at or under the threshold</span>
            <span>▲ over the threshold</span>
            <span>– – – threshold</span>
          </p>
          <div className="mt-3 overflow-x-auto">
            <table className="min-w-full text-sm" aria-label="Leak-rate events">
              <thead className="bg-ink-100 text-left text-xs uppercase tracking-wide text-ink-600">
                <tr>
                  <th scope="col" className="px-2 py-1.5">
                    Date
                  </th>
                  <th scope="col" className="px-2 py-1.5">
                    Added
                  </th>
                  <th scope="col" className="px-2 py-1.5">
                    Days since previous
                  </th>
                  <th scope="col" className="px-2 py-1.5">
                    Leak rate
                  </th>
                  <th scope="col" className="px-2 py-1.5">
                    Threshold
                  </th>
                  <th scope="col" className="px-2 py-1.5">
                    Result
                  </th>
                </tr>
              </thead>
              <tbody className="divide-y divide-ink-100">
                {events.map((e) => (
                  <tr key={`${e.on}-${e.jobIds.join("-")}`} data-testid="leak-event">
                    <td className="px-2 py-1.5 tabular whitespace-nowrap">
                      {e.on}
                      {e.firstOn !== e.on && <span className="block text-xs text-ink-600">same leak since {e.firstOn}</span>}
                    </td>
                    <td className="px-2 py-1.5 tabular whitespace-nowrap">
                      {formatMass(e.addedG, massUnit)}
                      {e.excludedG > 0 && (
                        <span className="block text-xs text-ink-600">+ {formatMass(e.excludedG, massUnit)} not counted</span>
                      )}
                    </td>
                    <td className="px-2 py-1.5 tabular">{intervalWords(e)}</td>
                    <td className="px-2 py-1.5 tabular">{pct(e.percent)}</td>
                    <td className="px-2 py-1.5 tabular">{e.threshold === null ? "not covered" : `${e.threshold} %`}</td>
                    <td className="px-2 py-1.5">
                      {e.threshold === null ? (
                        <span className="text-ink-600">No rule applies</span>
                      ) : e.exceeds ? (
                        <span className="font-medium text-sev-critical">
                          <span aria-hidden="true">▲ </span>Over the threshold
                        </span>
                      ) : (
                        <span className="text-ok">
                          <span aria-hidden="true">● </span>Within
                        </span>
                      )}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </>
      )}
    </section>
  );
}
