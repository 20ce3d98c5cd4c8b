import Link from "next/link";
import type { ContributingContainers } from "@/lib/register/finding-containers";

/** Every container that contributes to a finding: label (a link), substance, amount, state, owner. */
export function ContributingContainersList({ list }: { list: ContributingContainers }) {
  if (list.rows.length === 0) return <p className="text-sm text-ink-600">No container is recorded for this finding (it concerns the location itself).</p>;
  return (
    <div className="space-y-2">
      {list.basis === "inventory" ? (
        <p className="text-xs text-ink-600">This finding&apos;s stored working does not list its containers; these are the ones its location holds now with the same content.</p>
      ) : (
        <p className="text-xs text-ink-600">As the assessment counted them; a later move or change is noted.</p>
      )}
      <div className="overflow-x-auto">
        <table className="w-full text-sm">
          <thead>
            <tr className="border-b border-ink-200 text-left text-xs text-ink-600">
              <th scope="col" className="py-1 pr-3 font-medium">Container</th>
              <th scope="col" className="py-1 pr-3 font-medium">Substance</th>
              <th scope="col" className="py-1 pr-3 text-right font-medium">Amount</th>
              <th scope="col" className="py-1 pr-3 font-medium">State</th>
              <th scope="col" className="py-1 font-medium">Owner</th>
            </tr>
          </thead>
          <tbody>
            {list.rows.map((row) => (
              <tr key={row.id} className="border-b border-ink-100 align-top last:border-0">
                <th scope="row" className="py-1 pr-3 text-left font-medium">
                  {row.href ? (
                    <Link href={row.href} className="text-accent-700 hover:underline">
                      {row.label}
                    </Link>
                  ) : (
                    row.label
                  )}
                  {row.since ? <span className="block text-xs font-normal text-sev-moderate">{row.since}</span> : null}
                </th>
                <td className="py-1 pr-3 text-ink-800">{row.content}</td>
                <td className="tabular whitespace-nowrap py-1 pr-3 text-right text-ink-900">{row.amountText}</td>
                <td className="py-1 pr-3 text-ink-800">{row.state}</td>
                <td className="py-1 text-ink-800">{row.ownerName ?? "—"}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </div>
  );
}
