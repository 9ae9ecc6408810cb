"use client";

import { CartesianGrid, LabelList, Line, LineChart, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";

export interface MonthRow {
  month: string;
  opened: number;
  closed: number;
  active: number;
}

function Marker({ cx, cy, shape, color }: { cx?: number; cy?: number; shape: "circle" | "square" | "diamond"; color: string }) {
  if (cx === undefined || cy === undefined) return null;
  if (shape === "square") return <rect x={cx - 4} y={cy - 4} width={8} height={8} fill="#fff" stroke={color} strokeWidth={2} />;
  if (shape === "diamond") return <path d={`M${cx} ${cy - 5}L${cx + 5} ${cy}L${cx} ${cy + 5}L${cx - 5} ${cy}Z`} fill={color} />;
  return <circle cx={cx} cy={cy} r={4} fill={color} />;
}

/**
 * Findings opened and closed each month, and how many were still to act on at the month's end. Each
 * line has its own dash and marker shape and is named at its last point, so colour is not needed.
 */
export function FindingsOverTimeChart({ rows }: { rows: MonthRow[] }) {
  const last = rows.length - 1;
  // Names at the last point, one line apart so equal values do not print over each other.
  const endLabel = (name: string, line: number) =>
    function EndLabel(props: { index?: number; x?: number | string; y?: number | string; value?: unknown }) {
      return props.index === last ? (
        <text
          x={Number(props.x) + 8}
          y={Number(props.y) + 4 + line * 14}
          fontSize={12}
          fill="var(--color-ink-900)"
          stroke="#fff"
          strokeWidth={3}
          paintOrder="stroke"
        >
          {name} {String(props.value)}
        </text>
      ) : null;
    };
  return (
    <figure data-testid="findings-over-time-chart">
      <div
        className="h-64 w-full"
        role="img"
        aria-label={`Findings by month (count): ${rows.map((r) => `${r.month} opened ${r.opened}, closed ${r.closed}, to act on ${r.active}`).join("; ")}.`}
      >
        <ResponsiveContainer width="100%" height="100%">
          <LineChart data={rows} margin={{ top: 12, right: 110, bottom: 24, left: 8 }}>
            <CartesianGrid stroke="var(--color-ink-200)" strokeDasharray="2 4" />
            <XAxis
              dataKey="month"
              tick={{ fontSize: 12, fill: "var(--color-ink-700)" }}
              label={{ value: "Month", position: "insideBottom", offset: -14, fontSize: 12, fill: "var(--color-ink-700)" }}
            />
            <YAxis
              allowDecimals={false}
              width={44}
              tick={{ fontSize: 12, fill: "var(--color-ink-700)" }}
              label={{
                value: "Findings (count)",
                angle: -90,
                position: "insideLeft",
                fontSize: 12,
                fill: "var(--color-ink-700)",
                style: { textAnchor: "middle" },
              }}
            />
            <Tooltip />
            <Line
              name="To act on at month end"
              dataKey="active"
              stroke="var(--color-ink-900)"
              strokeWidth={3}
              dot={(p: object) => <Marker key={(p as { index: number }).index} {...p} shape="diamond" color="var(--color-ink-900)" />}
              isAnimationActive={false}
            >
              <LabelList dataKey="active" content={endLabel("to act on", -1)} />
            </Line>
            <Line
              name="Opened"
              dataKey="opened"
              stroke="var(--color-sev-major)"
              strokeWidth={2}
              dot={(p: object) => <Marker key={(p as { index: number }).index} {...p} shape="circle" color="var(--color-sev-major)" />}
              isAnimationActive={false}
            >
              <LabelList dataKey="opened" content={endLabel("opened", 0)} />
            </Line>
            <Line
              name="Closed"
              dataKey="closed"
              stroke="var(--color-fjord-600)"
              strokeWidth={2}
              strokeDasharray="6 4"
              dot={(p: object) => <Marker key={(p as { index: number }).index} {...p} shape="square" color="var(--color-fjord-600)" />}
              isAnimationActive={false}
            >
              <LabelList dataKey="closed" content={endLabel("closed", 1)} />
            </Line>
          </LineChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="mt-1 flex flex-wrap gap-x-4 text-sm text-ink-700">
        <span>◆ thick line: still to act on at month end</span>
        <span>● solid line: opened (found or found again)</span>
        <span>□ dashed line: closed (accepted, waived or no longer found)</span>
      </figcaption>
    </figure>
  );
}
