// The report's spectrum chart as static SVG, drawn from the same geometry as the PDF's chart:
// axes with ticks in nm, the calibrated trace and the identified lines labelled above their peaks.
import type { ChartGeometry } from "@/lib/reports/chart-geometry";

export function ReportChart({
  geometry,
  width,
  height,
  caption,
}: {
  geometry: ChartGeometry;
  width: number;
  height: number;
  caption: string;
}) {
  const { plot } = geometry;
  const path = geometry.trace.map(([x, y], i) => `${i === 0 ? "M" : "L"}${x} ${y}`).join("");
  return (
    <figure className="m-0">
      <svg
        viewBox={`0 0 ${width} ${height}`}
        className="h-auto w-full"
        role="img"
        aria-label={`Calibrated spectrum from ${geometry.xTicks[0]?.text ?? ""} to ${geometry.xTicks.at(-1)?.text ?? ""} nm with the identified lines labelled`}
        data-testid="report-chart"
        fontFamily="var(--font-sans), sans-serif"
      >
        <defs>
          <clipPath id="report-plot">
            <rect
              x={plot.left}
              y={plot.top}
              width={plot.right - plot.left}
              height={plot.bottom - plot.top}
            />
          </clipPath>
        </defs>
        <rect
          x={plot.left}
          y={plot.top}
          width={plot.right - plot.left}
          height={plot.bottom - plot.top}
          fill="none"
          stroke="currentColor"
          strokeWidth={0.6}
        />
        {geometry.xTicks.map((t) => (
          <g key={`x${t.value}`}>
            <line
              x1={t.at}
              x2={t.at}
              y1={plot.bottom}
              y2={plot.bottom + 3}
              stroke="currentColor"
              strokeWidth={0.5}
            />
            <text
              x={t.at}
              y={plot.bottom + 11}
              fontSize={7}
              textAnchor="middle"
              fill="currentColor"
            >
              {t.text}
            </text>
          </g>
        ))}
        {geometry.yTicks.map((t) => (
          <g key={`y${t.value}`}>
            <line
              x1={plot.left - 3}
              x2={plot.left}
              y1={t.at}
              y2={t.at}
              stroke="currentColor"
              strokeWidth={0.5}
            />
            <text
              x={plot.left - 5}
              y={t.at + 2.5}
              fontSize={7}
              textAnchor="end"
              fill="currentColor"
            >
              {t.text}
            </text>
          </g>
        ))}
        <text
          x={(plot.left + plot.right) / 2}
          y={plot.bottom + 22}
          fontSize={7}
          textAnchor="middle"
          fill="currentColor"
        >
          {geometry.xTitle}
        </text>
        <text
          x={8}
          y={(plot.top + plot.bottom) / 2}
          fontSize={7}
          textAnchor="middle"
          fill="currentColor"
          transform={`rotate(-90 8 ${(plot.top + plot.bottom) / 2})`}
        >
          {geometry.yTitle}
        </text>
        <path
          d={path}
          fill="none"
          stroke="#0072b2"
          strokeWidth={0.5}
          clipPath="url(#report-plot)"
        />
        {geometry.labels.map((l) => (
          <g
            key={`${l.text}${l.peakX}`}
            className={
              l.verdict === "present"
                ? "text-ember-700 dark:text-ember-300 print:text-ember-700"
                : "muted"
            }
          >
            <line
              x1={l.peakX}
              x2={l.peakX}
              y1={l.textY + 2}
              y2={Math.max(l.peakY - 2, l.textY + 2)}
              stroke="currentColor"
              strokeWidth={0.4}
              strokeDasharray="1.5 1.5"
            />
            <text
              x={l.textX}
              y={l.textY}
              fontSize={7}
              fontWeight={l.verdict === "present" ? 600 : 400}
              fill="currentColor"
            >
              {l.verdict === "present" ? l.text : `${l.text}?`}
            </text>
          </g>
        ))}
      </svg>
      <figcaption className="muted mt-1 text-xs">{caption}</figcaption>
    </figure>
  );
}
