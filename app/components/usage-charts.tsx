import { FOAM_CLASS_COLOURS } from "./usage-map";

/** A tidy upper end for an axis: 1, 2 or 5 times a power of ten. */
export function niceCeiling(value: number): number {
  if (!(value > 0)) return 1;
  const power = 10 ** Math.floor(Math.log10(value));
  for (const step of [1, 2, 5, 10]) if (step * power >= value) return step * power;
  return 10 * power;
}

const formatGal = (value: number) => value.toLocaleString("en-US", { maximumFractionDigits: value < 10 ? 1 : 0 });
const MONTHS = ["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"];

type MonthRow = { month: string; classAConcentrateGal: number; classBConcentrateGal: number };

/** Stacked bars: concentrate used per month, Class A below Class B. */
export function ConcentrateByMonthChart({ rows }: { rows: MonthRow[] }) {
  const width = 420;
  const height = 220;
  const margin = { top: 12, right: 8, bottom: 44, left: 52 };
  const plotWidth = width - margin.left - margin.right;
  const plotHeight = height - margin.top - margin.bottom;
  const top = niceCeiling(Math.max(0, ...rows.map((row) => row.classAConcentrateGal + row.classBConcentrateGal)));
  const band = plotWidth / Math.max(1, rows.length);
  const y = (value: number) => plotHeight - (value / top) * plotHeight;
  const ticks = [0, top / 2, top];
  return (
    <figure>
      <figcaption className="text-sm font-semibold">Concentrate used by month and foam class</figcaption>
      <svg
        viewBox={`0 0 ${width} ${height}`}
        className="mt-1 w-full"
        role="img"
        aria-label="Bar chart of concentrate used per month, in US gallons, split into Class A and Class B"
      >
        <g transform={`translate(${margin.left},${margin.top})`}>
          {ticks.map((tick) => (
            <g key={tick} transform={`translate(0,${y(tick)})`}>
              <line x2={plotWidth} stroke="#d6d3d1" />
              <text x={-6} dy="0.32em" textAnchor="end" fontSize="11" fill="#3d4a5c">
                {formatGal(tick)}
              </text>
            </g>
          ))}
          {rows.map((row, index) => {
            const x = index * band + band * 0.15;
            const barWidth = band * 0.7;
            const [year, month] = row.month.split("-");
            return (
              <g key={row.month}>
                <rect
                  x={x}
                  width={barWidth}
                  y={y(row.classAConcentrateGal)}
                  height={plotHeight - y(row.classAConcentrateGal)}
                  fill={FOAM_CLASS_COLOURS.A}
                >
                  <title>{`${row.month}: Class A ${formatGal(row.classAConcentrateGal)} gal`}</title>
                </rect>
                <rect
                  x={x}
                  width={barWidth}
                  y={y(row.classAConcentrateGal + row.classBConcentrateGal)}
                  height={plotHeight - y(row.classBConcentrateGal)}
                  fill={FOAM_CLASS_COLOURS.B}
                >
                  <title>{`${row.month}: Class B ${formatGal(row.classBConcentrateGal)} gal`}</title>
                </rect>
                <text x={x + barWidth / 2} y={plotHeight + 14} textAnchor="middle" fontSize="10" fill="#3d4a5c">
                  {MONTHS[Number(month) - 1]}
                </text>
                {(index === 0 && month !== "12") || month === "01" ? (
                  <text x={x + barWidth / 2} y={plotHeight + 26} textAnchor="middle" fontSize="10" fill="#3d4a5c">
                    {year}
                  </text>
                ) : null}
              </g>
            );
          })}
          <line y1={plotHeight} y2={plotHeight} x2={plotWidth} stroke="#3d4a5c" />
          <text
            transform={`translate(${-40},${plotHeight / 2}) rotate(-90)`}
            textAnchor="middle"
            fontSize="11"
            fill="#1b2430"
          >
            Concentrate (US gal)
          </text>
          <text x={plotWidth / 2} y={plotHeight + 40} textAnchor="middle" fontSize="11" fill="#1b2430">
            Month (agency time)
          </text>
        </g>
      </svg>
      <ChartKey />
    </figure>
  );
}

function ChartKey() {
  return (
    <p className="flex gap-4 text-xs text-slate-ft">
      <span className="flex items-center gap-1">
        <span aria-hidden="true" className="inline-block h-3 w-3" style={{ background: FOAM_CLASS_COLOURS.A }} />
        Class A
      </span>
      <span className="flex items-center gap-1">
        <span aria-hidden="true" className="inline-block h-3 w-3" style={{ background: FOAM_CLASS_COLOURS.B }} />
        Class B
      </span>
    </p>
  );
}

type StationRow = { station: string | null; name: string | null; concentrateGal: number };

/** Horizontal bars: concentrate used by station. */
export function ConcentrateByStationChart({ rows }: { rows: StationRow[] }) {
  const width = 420;
  const rowHeight = 26;
  const margin = { top: 8, right: 56, bottom: 34, left: 150 };
  const height = margin.top + margin.bottom + Math.max(1, rows.length) * rowHeight;
  const plotWidth = width - margin.left - margin.right;
  const top = niceCeiling(Math.max(0, ...rows.map((row) => row.concentrateGal)));
  return (
    <figure>
      <figcaption className="text-sm font-semibold">Concentrate used by station</figcaption>
      <svg
        viewBox={`0 0 ${width} ${height}`}
        className="mt-1 w-full"
        role="img"
        aria-label="Bar chart of concentrate used per station, in US gallons"
      >
        <g transform={`translate(${margin.left},${margin.top})`}>
          {rows.length === 0 ? (
            <text x={0} y={16} fontSize="12" fill="#3d4a5c">
              No events in view.
            </text>
          ) : null}
          {rows.map((row, index) => {
            const barWidth = (row.concentrateGal / top) * plotWidth;
            const label = row.station ? `${row.station} ${row.name ?? ""}`.trim() : "No station";
            return (
              <g key={row.station ?? "none"} transform={`translate(0,${index * rowHeight})`}>
                <text x={-6} y={rowHeight / 2} dy="0.32em" textAnchor="end" fontSize="11" fill="#1b2430">
                  {label.length > 24 ? `${label.slice(0, 23)}…` : label}
                </text>
                <rect y={4} height={rowHeight - 8} width={barWidth} fill="#17565f" />
                <text x={barWidth + 4} y={rowHeight / 2} dy="0.32em" fontSize="11" fill="#1b2430">
                  {formatGal(row.concentrateGal)}
                </text>
              </g>
            );
          })}
          <line y1={rows.length * rowHeight} y2={rows.length * rowHeight} x2={plotWidth} stroke="#3d4a5c" />
          <text x={0} y={rows.length * rowHeight + 14} fontSize="10" fill="#3d4a5c">
            0
          </text>
          <text x={plotWidth} y={rows.length * rowHeight + 14} textAnchor="end" fontSize="10" fill="#3d4a5c">
            {formatGal(top)}
          </text>
          <text x={plotWidth / 2} y={rows.length * rowHeight + 28} textAnchor="middle" fontSize="11" fill="#1b2430">
            Concentrate (US gal)
          </text>
        </g>
      </svg>
    </figure>
  );
}
