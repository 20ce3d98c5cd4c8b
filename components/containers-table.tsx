import Link from "next/link";
import { priorityCellClass, SecondaryValues, TABLE_CONTAINER_CLASS } from "@/components/data-table/priority";
import { CONTAINER_STATE_LABELS } from "@/lib/format/container-labels";
import { formatQuantity } from "@/lib/format/numbers";
import type { ContainerState } from "@/db/enums";

type Row = {
  id: number;
  label: string;
  substanceName: string | null;
  mixtureName: string | null;
  amount: number;
  amountUnit: string;
  state: ContainerState;
  unitCode: string;
  ownerName: string | null;
};

/** A compact container list for room and unit pages. */
export function ContainersTable({ rows, showUnit = true }: { rows: Row[]; showUnit?: boolean }) {
  if (rows.length === 0) return <p className="text-sm text-ink-600">No containers are stored here.</p>;
  return (
    <div className={`${TABLE_CONTAINER_CLASS} -mx-4 -my-4 overflow-x-auto`}>
      <table className="w-full text-sm">
        <thead className="sticky top-0 bg-white">
          <tr className="border-b border-ink-200 text-left text-xs uppercase tracking-wide text-ink-600">
            <th scope="col" className="px-4 py-2 font-medium">Label</th>
            <th scope="col" className="px-4 py-2 font-medium">Contents</th>
            <th scope="col" className="px-4 py-2 text-right font-medium">Amount</th>
            <th scope="col" className={`px-4 py-2 font-medium ${priorityCellClass(2)}`}>State</th>
            {showUnit ? <th scope="col" className="px-4 py-2 font-medium">Unit</th> : null}
            <th scope="col" className={`px-4 py-2 font-medium ${priorityCellClass(2)}`}>Owner</th>
          </tr>
        </thead>
        <tbody className="tabular">
          {rows.map((c) => (
            <tr key={c.id} className="border-b border-ink-100 last:border-0">
              <th scope="row" className="px-4 py-2 text-left font-mono font-normal">
                <Link href={`/inventory/${c.id}`} className="text-accent-800 hover:underline">
                  {c.label}
                </Link>
                <SecondaryValues
                  items={[
                    { key: "state", label: "State", value: CONTAINER_STATE_LABELS[c.state], priority: 2 },
                    { key: "owner", label: "Owner", value: c.ownerName ?? "—", priority: 2 },
                  ]}
                />
              </th>
              <td className="px-4 py-2">{c.substanceName ?? c.mixtureName}</td>
              <td className="px-4 py-2 text-right">{formatQuantity(c.amount, c.amountUnit)}</td>
              <td className={`px-4 py-2 ${priorityCellClass(2)}`}>{CONTAINER_STATE_LABELS[c.state]}</td>
              {showUnit ? <td className="px-4 py-2 font-mono text-xs">{c.unitCode}</td> : null}
              <td className={`px-4 py-2 ${priorityCellClass(2)}`}>{c.ownerName ?? "—"}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
