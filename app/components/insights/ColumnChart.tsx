// Columns over time (first-time-fix rate by month) with a percentage axis. visx scales and axes at
// the measured width; month labels thin out on a phone so they never overlap.
import { AxisBottom, AxisLeft } from "@visx/axis";
import { Group } from "@visx/group";
import { scaleBand, scaleLinear } from "@visx/scale";
import { Bar } from "@visx/shape";
import { useParentSize } from "@visx/responsive";

export type ColumnDatum = { label: string; short: string; value: number | null; text: string };

const HEIGHT = 220;
const M = { top: 12, right: 8, bottom: 30, left: 56 };

export function ColumnChart({ data, label }: { data: ColumnDatum[]; label: string }) {
  const { parentRef, width: measured } = useParentSize({ initialSize: { width: 640 }, debounceTime: 60 });
  const width = Math.max(measured || 640, 240);
  const innerW = width - M.left - M.right;
  const innerH = HEIGHT - M.top - M.bottom;
  const x = scaleBand<string>({ domain: data.map((d) => d.label), range: [0, innerW], padding: 0.25 });
  const y = scaleLinear<number>({ domain: [0, 1], range: [innerH, 0] });
  const every = Math.max(1, Math.ceil((data.length * 40) / innerW));
  return (
    <div ref={parentRef} className="w-full">
      <svg width="100%" height={HEIGHT} viewBox={`0 0 ${width} ${HEIGHT}`} role="img" aria-label={label} className="block">
        <Group left={M.left} top={M.top}>
          {[0.25, 0.5, 0.75, 1].map((t) => (
            <line key={t} x1={0} x2={innerW} y1={y(t)} y2={y(t)} className="stroke-rule" />
          ))}
          {data.map((d) =>
            d.value === null ? null : (
              <Bar
                key={d.label}
                x={x(d.label)}
                y={y(d.value)}
                width={x.bandwidth()}
                height={innerH - y(d.value)}
                rx={2}
                className="fill-copper"
              />
            ),
          )}
          <AxisLeft
            scale={y}
            tickValues={[0, 0.5, 1]}
            tickFormat={(v) => `${Math.round(Number(v) * 100)} %`}
            stroke="var(--color-ink-soft)"
            tickStroke="var(--color-ink-soft)"
            tickLabelProps={{ fill: "var(--color-ink)", fontSize: 13, textAnchor: "end", dx: -4, dy: 4 }}
          />
          <AxisBottom
            top={innerH}
            scale={x}
            tickValues={data.filter((_, i) => i % every === 0).map((d) => d.label)}
            tickFormat={(v) => data.find((d) => d.label === v)?.short ?? String(v)}
            stroke="var(--color-ink-soft)"
            tickStroke="var(--color-ink-soft)"
            tickLabelProps={{ fill: "var(--color-ink)", fontSize: 13, textAnchor: "middle" }}
          />
        </Group>
      </svg>
    </div>
  );
}
