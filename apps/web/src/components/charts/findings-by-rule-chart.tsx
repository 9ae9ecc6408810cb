"use client";

import { Bar, BarChart, CartesianGrid, LabelList, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import { SEVERITIES, SEVERITY_LABELS } from "@coldtrail/core";
import { fill, Swatch } from "./chart-patterns";

export interface RuleRow {
  ruleId: string;
  title: string;
  critical: number;
  major: number;
  minor: number;
  total: number;
}

/** Writes the row's total just after its last non-empty segment (whichever severity that is). */
function totalAtEnd(rows: RuleRow[], severity: (typeof SEVERITIES)[number]) {
  function TotalLabel(props: {
    index?: number;
    x?: number | string;
    y?: number | string;
    width?: number | string;
    height?: number | string;
  }) {
    const row = props.index === undefined ? undefined : rows[props.index];
    if (!row) return null;
    const last = [...SEVERITIES].reverse().find((s) => row[s] > 0);
    if (last !== severity) return null;
    return (
      <text
        x={Number(props.x) + Number(props.width) + 6}
        y={Number(props.y) + Number(props.height) / 2 + 4}
        fontSize={12}
        fontWeight={700}
        fill="var(--color-ink-950)"
      >
        {row.total}
      </text>
    );
  }
  return TotalLabel;
}

/** Findings to act on per rule, stacked by severity, with the total written at the end of each bar. */
export function FindingsByRuleChart({ rows }: { rows: RuleRow[] }) {
  if (rows.length === 0) return <p className="text-sm text-ink-600">No findings to act on.</p>;
  const height = Math.max(140, rows.length * 34 + 50);
  return (
    <figure className="space-y-2" data-testid="findings-by-rule-chart">
      <div
        style={{ height }}
        className="w-full"
        role="img"
        aria-label={`Findings to act on by rule (count): ${rows.map((r) => `${r.ruleId} ${r.total}`).join(", ")}.`}
      >
        <ResponsiveContainer width="100%" height="100%">
          <BarChart data={rows} layout="vertical" margin={{ top: 4, right: 36, bottom: 24, left: 8 }} barCategoryGap="22%">
            <CartesianGrid stroke="var(--color-ink-200)" strokeDasharray="2 4" horizontal={false} />
            <XAxis
              type="number"
              allowDecimals={false}
              tick={{ fontSize: 12, fill: "var(--color-ink-700)" }}
              label={{ value: "Findings (count)", position: "insideBottom", offset: -14, fontSize: 12, fill: "var(--color-ink-700)" }}
            />
            <YAxis type="category" dataKey="ruleId" width={104} tick={{ fontSize: 12, fill: "var(--color-ink-900)" }} />
            <Tooltip labelFormatter={(id) => `${String(id)} · ${rows.find((r) => r.ruleId === id)?.title ?? ""}`} />
            {SEVERITIES.map((s) => (
              <Bar
                key={s}
                dataKey={s}
                name={SEVERITY_LABELS[s]}
                stackId="rule"
                fill={fill(s)}
                stroke="var(--color-ink-900)"
                strokeWidth={0.6}
                isAnimationActive={false}
              >
                <LabelList dataKey="total" content={totalAtEnd(rows, s)} />
              </Bar>
            ))}
          </BarChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="flex flex-wrap gap-x-4 gap-y-1 text-sm text-ink-700">
        <Swatch pattern="critical" label="Critical" />
        <Swatch pattern="major" label="Major" />
        <Swatch pattern="minor" label="Minor" />
      </figcaption>
    </figure>
  );
}
