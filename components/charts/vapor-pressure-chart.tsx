"use client";
import { CartesianGrid, Line, LineChart, ReferenceDot, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import { formatNumber } from "@/lib/format/numbers";

export type VaporCurvePoint = { tempC: number; pressureKPa: number; extrapolated: boolean };

type Props = {
  points: VaporCurvePoint[];
  /** Partial pressure at the LFL at the ambient pressure, kPa. */
  lflPressureKPa: number | null;
  lflVolPercent: number | null;
  lowerFlammableTemperatureC: number | null;
  ambientPressureKPa: number;
  markTempC?: { tempC: number; label: string } | null;
  /** A point used by a calculation (a finding's T and Psat), drawn as a filled dot with its label. */
  markPoint?: { tempC: number; pressureKPa: number; label: string } | null;
};

const ACCENT = "#0b5d6b";
const LFL = "#a3171b";
const INK = "#56687a";

/**
 * Saturation vapor pressure against temperature on a log scale, with the LFL partial pressure as
 * a line and the lower flammable temperature marked. Line styles (solid, dashed, dotted) and
 * labels carry the meaning, not colour alone.
 */
export function VaporPressureChart({ points, lflPressureKPa, lflVolPercent, lowerFlammableTemperatureC, ambientPressureKPa, markTempC, markPoint }: Props) {
  const data = points.map((p) => ({
    tempC: p.tempC,
    measured: p.extrapolated ? null : p.pressureKPa,
    extrapolated: p.extrapolated ? p.pressureKPa : null,
  }));
  // Join the two series where they meet so the curve has no gap.
  for (let i = 1; i < data.length; i += 1) {
    if (data[i].extrapolated != null && data[i - 1].measured != null) data[i].measured = data[i].extrapolated;
    if (data[i].measured != null && data[i - 1].extrapolated != null) data[i - 1].measured = data[i - 1].extrapolated;
  }
  const pressures = points.map((p) => p.pressureKPa).filter((v) => v > 0);
  const minKPa = Math.min(...pressures, lflPressureKPa ?? Infinity);
  const maxKPa = Math.max(...pressures, ambientPressureKPa, markPoint?.pressureKPa ?? 0);
  const domain: [number, number] = [10 ** Math.floor(Math.log10(minKPa)), 10 ** Math.ceil(Math.log10(maxKPa))];
  const lftOnChart = lowerFlammableTemperatureC != null && lowerFlammableTemperatureC >= -40 && lowerFlammableTemperatureC <= 60;
  return (
    <figure>
      <div className="h-80 w-full" role="img" aria-label="Saturation vapor pressure from −40 to 60 °C on a logarithmic scale">
        <ResponsiveContainer width="100%" height="100%">
          <LineChart data={data} margin={{ top: 12, right: 24, bottom: 24, left: 8 }}>
            <CartesianGrid stroke="#dde3e9" strokeDasharray="3 3" />
            <XAxis
              dataKey="tempC"
              type="number"
              domain={[-40, 60]}
              ticks={[-40, -30, -20, -10, 0, 10, 20, 30, 40, 50, 60]}
              tickFormatter={(t: number) => `${t}`.replace("-", "−")}
              label={{ value: "Temperature (°C)", position: "insideBottom", offset: -12, fill: INK, fontSize: 12 }}
              tick={{ fontSize: 12, fill: INK }}
            />
            <YAxis
              scale="log"
              domain={domain}
              allowDataOverflow
              type="number"
              tickFormatter={(v: number) => formatNumber(v, 2)}
              label={{ value: "Psat (kPa)", angle: -90, position: "insideLeft", fill: INK, fontSize: 12 }}
              tick={{ fontSize: 12, fill: INK }}
              width={72}
            />
            <Tooltip
              formatter={(value) => [`${formatNumber(Number(value), 3)} kPa`, "Psat"]}
              labelFormatter={(t) => `${String(t).replace("-", "−")} °C`}
            />
            <ReferenceLine y={ambientPressureKPa} stroke={INK} strokeDasharray="2 4" label={{ value: `boils above ${formatNumber(ambientPressureKPa, 4)} kPa`, position: "insideTopLeft", fill: INK, fontSize: 11 }} />
            {lflPressureKPa != null ? (
              <ReferenceLine y={lflPressureKPa} stroke={LFL} strokeDasharray="8 4" label={{ value: `LFL ${formatNumber(lflVolPercent, 2)} % vol = ${formatNumber(lflPressureKPa, 3)} kPa`, position: "insideBottomRight", fill: LFL, fontSize: 11 }} />
            ) : null}
            {lftOnChart ? (
              <ReferenceDot x={lowerFlammableTemperatureC!} y={lflPressureKPa!} r={5} fill="#fff" stroke={LFL} strokeWidth={2} label={{ value: `LFT ${formatNumber(lowerFlammableTemperatureC, 3)} °C`, position: "top", fill: LFL, fontSize: 11 }} />
            ) : null}
            {markTempC ? <ReferenceLine x={markTempC.tempC} stroke={ACCENT} label={{ value: markTempC.label, position: "insideTopRight", fill: ACCENT, fontSize: 11 }} /> : null}
            {markPoint ? (
              <ReferenceDot x={markPoint.tempC} y={markPoint.pressureKPa} r={6} fill={ACCENT} stroke="#fff" strokeWidth={2} ifOverflow="extendDomain" label={{ value: markPoint.label, position: "left", fill: ACCENT, fontSize: 11 }} />
            ) : null}
            <Line type="monotone" dataKey="measured" stroke={ACCENT} strokeWidth={2.25} dot={false} isAnimationActive={false} connectNulls={false} name="Psat" />
            <Line type="monotone" dataKey="extrapolated" stroke={ACCENT} strokeWidth={2} strokeDasharray="5 4" dot={false} isAnimationActive={false} connectNulls={false} name="Psat (extrapolated)" />
          </LineChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="mt-2 text-xs text-ink-600">
        Solid line: within the correlation&apos;s range. Dashed: extrapolated or estimated. Red dashed line: the LFL as a partial pressure at{" "}
        {formatNumber(ambientPressureKPa, 4)} kPa; where the curve crosses it is the lower flammable temperature (LFT).
        {markPoint ? ` Filled dot: the point this calculation used, ${markPoint.label}.` : ""}
        {lowerFlammableTemperatureC != null && !lftOnChart
          ? ` The LFT, ${formatNumber(lowerFlammableTemperatureC, 3)} °C, is ${lowerFlammableTemperatureC < -40 ? "below" : "above"} the chart's range.`
          : ""}
      </figcaption>
    </figure>
  );
}
