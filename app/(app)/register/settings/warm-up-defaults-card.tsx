import { Card } from "@/components/ui/card";
import { formatTauMin, HOLDING_TIME_TO_TAU, WARM_UP_DEFAULTS } from "@/lib/temperatures/warm-up-defaults";

/** The default warm-up time constant of each kind of temperature-controlled unit, with its reasoning and source. */
export function WarmUpDefaultsCard() {
  return (
    <Card title="Warm-up after a failure: defaults per kind of unit">
      <p className="mb-3 text-sm text-ink-700">
        How fast a refrigerator, freezer or cold room warms towards its room&apos;s temperature once its cooling stops (Newton&apos;s law of heating, T(t) = T
        <sub>room</sub> − (T<sub>room</sub> − T<sub>start</sub>)·e<sup>−t/τ</sup>). A unit uses the τ set on its page (by facilities, a safety officer or an administrator), else
        the τ fitted to its own recorded failures, else the default of its kind below. A screening estimate: the unit&apos;s own logger is what tells you its temperature.
      </p>
      <p className="mb-3 text-sm text-ink-700">
        <span className="font-semibold text-ink-900">How a holding time becomes τ. </span>
        {HOLDING_TIME_TO_TAU}
      </p>
      <div className="overflow-x-auto">
        <table className="w-full min-w-[40rem] border-collapse text-sm">
          <caption className="sr-only">Default warm-up time constants, their reasoning and their sources</caption>
          <thead className="bg-ink-50 text-left text-xs font-semibold text-ink-700">
            <tr>
              <th scope="col" className="px-2 py-2">
                Kind of unit
              </th>
              <th scope="col" className="px-2 py-2">
                Default τ
              </th>
              <th scope="col" className="px-2 py-2">
                Why
              </th>
              <th scope="col" className="px-2 py-2">
                Source
              </th>
            </tr>
          </thead>
          <tbody>
            {WARM_UP_DEFAULTS.map((d) => (
              <tr key={d.kind} className="border-t border-ink-200 align-top">
                <th scope="row" className="px-2 py-2 text-left font-medium text-ink-900">
                  {d.label.charAt(0).toUpperCase() + d.label.slice(1)}
                </th>
                <td className="tabular px-2 py-2 whitespace-nowrap">{formatTauMin(d.tauMin)}</td>
                <td className="px-2 py-2 text-ink-800">{d.reasoning}</td>
                <td className="px-2 py-2 text-xs text-ink-700">{d.source}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </Card>
  );
}
