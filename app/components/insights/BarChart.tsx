// Horizontal bars, one per table row: the row's label on its own line above its bar, so long root
// causes and part names stay readable on a phone. visx draws at the element's measured width
// (server render: 640 px, scaled to fit until the browser measures).
import { Bar } from "@visx/shape";
import { scaleLinear } from "@visx/scale";
import { useParentSize } from "@visx/responsive";

export type BarDatum = { label: string; value: number; text: string };

const ROW = 46;
const LABEL = 18;
const BAR = 16;

/** `max`: the scale's end (1 for shares, so 9 % never looks like a full bar); the largest value otherwise. */
export function BarChart({ data, label, max: fixed }: { data: BarDatum[]; label: string; max?: number }) {
  const { parentRef, width: measured } = useParentSize({ initialSize: { width: 640 }, debounceTime: 60 });
  const width = Math.max(measured || 640, 240);
  const height = Math.max(data.length, 1) * ROW;
  const max = fixed ?? Math.max(0, ...data.map((d) => d.value));
  const valueRoom = 76;
  const x = scaleLinear<number>({ domain: [0, max || 1], range: [0, width - valueRoom] });
  // About 7.5 px a character at 15 px: a longer label is cut with an ellipsis (the table has it whole).
  const fits = Math.max(12, Math.floor(width / 7.6));
  return (
    <div ref={parentRef} className="w-full">
      <svg width="100%" height={height} viewBox={`0 0 ${width} ${height}`} role="img" aria-label={label} className="block overflow-visible">
        {data.map((d, i) => {
          const y = i * ROW;
          const w = Math.max(x(d.value), d.value > 0 ? 2 : 0);
          return (
            <g key={`${d.label}-${i}`}>
              <text x={0} y={y + LABEL - 4} className="fill-ink text-[15px]">
                {d.label.length > fits ? `${d.label.slice(0, fits - 1).trimEnd()}…` : d.label}
                <title>{d.label}</title>
              </text>
              <Bar x={0} y={y + LABEL + 2} width={w} height={BAR} rx={3} className="fill-copper" />
              <text x={w + 6} y={y + LABEL + 2 + BAR - 3} className="fill-ink text-[15px] font-semibold">
                {d.text}
              </text>
            </g>
          );
        })}
      </svg>
    </div>
  );
}
