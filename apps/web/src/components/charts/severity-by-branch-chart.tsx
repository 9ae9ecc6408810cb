"use client";

import { Bar, BarChart, CartesianGrid, LabelList, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import { SEVERITIES, SEVERITY_LABELS } from "@coldtrail/core";
import { fill, Swatch } from "./chart-patterns";

export interface BranchSeverityRow {
  name: string;
  critical: number;
  major: number;
  minor: number;
}

/** The count on a segment, with a white halo so it reads on solid, striped or dotted fills alike. */
function CountLabel(props: {
  x?: number | string;
  y?: number | string;
  width?: number | string;
  height?: number | string;
  value?: unknown;
}) {
  const value = typeof props.value === "number" ? props.value : Number(props.value);
  if (!(value > 0)) return null;
  return (
    <text
      x={Number(props.x) + Number(props.width) / 2}
      y={Number(props.y) + Number(props.height) / 2 + 4}
      textAnchor="middle"
      fontSize={12}
      fontWeight={700}
      fill="var(--color-ink-950)"
      stroke="#fff"
      strokeWidth={3}
      paintOrder="stroke"
    >
      {value}
    </text>
  );
}

/**
 * Open findings by severity for every branch: one stacked bar per branch, each severity with its own
 * fill pattern and its count written on the bar; a legend in words; the same numbers in a table.
 */
export function SeverityByBranchChart({ rows }: { rows: BranchSeverityRow[] }) {
  const total = rows.reduce((n, r) => n + r.critical + r.major + r.minor, 0);
  const summary = rows.map((r) => `${r.name}: ${r.critical} critical, ${r.major} major, ${r.minor} minor`).join("; ");
  return (
    <figure className="space-y-2" data-testid="severity-by-branch-chart">
      <div className="h-64 w-full" role="img" aria-label={`Open findings by severity for each branch (count). ${summary}.`}>
        <ResponsiveContainer width="100%" height="100%">
          <BarChart data={rows} layout="vertical" margin={{ top: 4, right: 24, bottom: 24, left: 8 }} barCategoryGap="25%">
            <CartesianGrid stroke="var(--color-ink-200)" strokeDasharray="2 4" horizontal={false} />
            <XAxis
              type="number"
              allowDecimals={false}
              tick={{ fontSize: 12, fill: "var(--color-ink-700)" }}
              label={{ value: "Open findings (count)", position: "insideBottom", offset: -14, fontSize: 12, fill: "var(--color-ink-700)" }}
            />
            <YAxis type="category" dataKey="name" width={90} tick={{ fontSize: 13, fill: "var(--color-ink-900)" }} />
            <Tooltip cursor={{ fill: "var(--color-ink-100)" }} />
            {SEVERITIES.map((s) => (
              <Bar
                key={s}
                dataKey={s}
                name={SEVERITY_LABELS[s]}
                stackId="sev"
                fill={fill(s)}
                stroke="var(--color-ink-900)"
                strokeWidth={0.6}
                isAnimationActive={false}
              >
                <LabelList dataKey={s} content={CountLabel} />
              </Bar>
            ))}
          </BarChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="flex flex-wrap gap-x-4 gap-y-1 text-sm text-ink-700">
        <Swatch pattern="critical" label="Critical (solid)" />
        <Swatch pattern="major" label="Major (stripes)" />
        <Swatch pattern="minor" label="Minor (dots)" />
        <span className="text-ink-600">· {total} open in all</span>
      </figcaption>
    </figure>
  );
}
