"use client";

import { Bar, BarChart, CartesianGrid, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import { formatMass, type MassDisplayUnit } from "@coldtrail/core";
import { fill, Swatch, type PatternKey } from "./chart-patterns";

export interface FlowRow {
  month: string;
  purchasedG: number;
  chargedG: number;
  recoveredG: number;
  shippedG: number;
}

const SERIES: { key: keyof Omit<FlowRow, "month">; pattern: PatternKey; label: string }[] = [
  { key: "purchasedG", pattern: "purchased", label: "Purchased (solid)" },
  { key: "chargedG", pattern: "charged", label: "Charged into appliances (stripes)" },
  { key: "recoveredG", pattern: "recovered", label: "Recovered (grid)" },
  { key: "shippedG", pattern: "shipped", label: "Shipped for reclaim (dots)" },
];

/**
 * Refrigerant purchased, charged, recovered and shipped for reclaim each month, in the branch's unit.
 * Each series has its own fill pattern; the figures follow in a table.
 */
export function RefrigerantFlowsChart({ rows, massUnit }: { rows: FlowRow[]; massUnit: MassDisplayUnit }) {
  const unit = massUnit === "kg" ? "kg" : "lb";
  const toUnit = (g: number) => Math.round((massUnit === "kg" ? g / 1000 : g / 453.59237) * 10) / 10;
  const data = rows.map((r) => ({
    month: r.month,
    purchasedG: toUnit(r.purchasedG),
    chargedG: toUnit(r.chargedG),
    recoveredG: toUnit(r.recoveredG),
    shippedG: toUnit(r.shippedG),
  }));
  const totals = SERIES.map((s) => [s, rows.reduce((n, r) => n + r[s.key], 0)] as const);
  return (
    <figure className="space-y-2" data-testid="refrigerant-flows-chart">
      <div
        className="h-72 w-full"
        role="img"
        aria-label={`Refrigerant by month in ${unit}. Totals: ${totals.map(([s, g]) => `${s.label.replace(/ \(.*\)/, "")} ${formatMass(g, massUnit)}`).join(", ")}.`}
      >
        <ResponsiveContainer width="100%" height="100%">
          <BarChart data={data} margin={{ top: 8, right: 16, bottom: 24, left: 8 }} barGap={1}>
            <CartesianGrid stroke="var(--color-ink-200)" strokeDasharray="2 4" vertical={false} />
            <XAxis
              dataKey="month"
              tick={{ fontSize: 11, fill: "var(--color-ink-700)" }}
              label={{ value: "Month", position: "insideBottom", offset: -14, fontSize: 12, fill: "var(--color-ink-700)" }}
            />
            <YAxis
              width={60}
              tick={{ fontSize: 12, fill: "var(--color-ink-700)" }}
              unit={` ${unit}`}
              label={{
                value: `Refrigerant (${unit})`,
                angle: -90,
                position: "insideLeft",
                offset: 0,
                fontSize: 12,
                fill: "var(--color-ink-700)",
                style: { textAnchor: "middle" },
              }}
            />
            <Tooltip formatter={(v, name) => [`${String(v)} ${unit}`, String(name).replace(/ \(.*\)/, "")]} />
            {SERIES.map((s) => (
              <Bar
                key={s.key}
                dataKey={s.key}
                name={s.label}
                fill={fill(s.pattern)}
                stroke="var(--color-ink-900)"
                strokeWidth={0.5}
                isAnimationActive={false}
              />
            ))}
          </BarChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="flex flex-wrap gap-x-4 gap-y-1 text-sm text-ink-700">
        {SERIES.map((s) => (
          <Swatch key={s.key} pattern={s.pattern} label={s.label} />
        ))}
      </figcaption>
      <details className="text-sm">
        <summary className="cursor-pointer text-fjord-700">The figures by month ({unit})</summary>
        <table className="mt-2 min-w-full text-sm">
          <thead className="text-left text-xs uppercase text-ink-600">
            <tr>
              <th scope="col">Month</th>
              <th scope="col" className="text-right">
                Purchased ({unit})
              </th>
              <th scope="col" className="text-right">
                Charged ({unit})
              </th>
              <th scope="col" className="text-right">
                Recovered ({unit})
              </th>
              <th scope="col" className="text-right">
                Shipped ({unit})
              </th>
            </tr>
          </thead>
          <tbody className="tabular">
            {data.map((r) => (
              <tr key={r.month}>
                <td>{r.month}</td>
                <td className="text-right">{r.purchasedG}</td>
                <td className="text-right">{r.chargedG}</td>
                <td className="text-right">{r.recoveredG}</td>
                <td className="text-right">{r.shippedG}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </details>
    </figure>
  );
}
