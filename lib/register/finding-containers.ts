import "server-only";
import { containersByIds, containersNowAt, type FindingContainerRow } from "@/db/queries/finding-containers";
import { CONTAINER_STATE_LABELS } from "@/lib/format/container-labels";
import { formatTraceValue, traceContainers } from "./trace-steps";

/** One container that contributes to a finding, as assessed and as it is now. */
export type ContributingContainer = {
  id: number;
  label: string;
  content: string;
  /** The amount the assessment used, with its unit. */
  amountText: string;
  /** Its state when assessed ("sealed", "open", "in use"). */
  state: string;
  ownerName: string | null;
  /** Where it is now, when that is not where the finding is; or that it is now empty, disposed, or gone. */
  since: string | null;
  href: string | null;
};

export type ContributingContainers = {
  rows: ContributingContainer[];
  /** "assessment": the list the rules recorded in the trace; "inventory": derived from what is stored there now (a trace written before the list was kept). */
  basis: "assessment" | "inventory";
};

const stateLabel = (state: string) => (CONTAINER_STATE_LABELS as Record<string, string>)[state]?.toLowerCase() ?? state.replace("_", " ");

/**
 * Every container that contributes to a finding (label, substance, amount, state, owner, link):
 * the list the assessment recorded in the finding's trace, with each container's owner and where
 * it is now; for a trace stored before the list was kept, the containers now at the finding's
 * location holding its substance or mixture.
 */
export function contributingContainers(finding: {
  trace: unknown;
  roomId: number | null;
  storageUnitId: number | null;
  substanceId: number | null;
  mixtureId: number | null;
  containerId: number | null;
}): ContributingContainers {
  const recorded = traceContainers(finding.trace);
  if (recorded.length > 0) {
    const now = new Map(containersByIds(recorded.map((c) => c.containerId)).map((row) => [row.id, row]));
    return {
      basis: "assessment",
      rows: recorded.map((c) => {
        const row = now.get(c.containerId);
        let since: string | null = null;
        if (!row) since = "no longer in the inventory";
        else if (row.state === "empty" || row.state === "disposed") since = `now ${stateLabel(row.state)}`;
        else if (finding.storageUnitId != null ? row.storageUnitId !== finding.storageUnitId : row.roomId !== finding.roomId) since = `now in ${row.unitCode}`;
        return {
          id: c.containerId,
          label: c.label,
          content: c.content,
          amountText: c.amountText,
          state: c.state,
          ownerName: row?.ownerName ?? null,
          since,
          href: row ? `/inventory/${c.containerId}` : null,
        };
      }),
    };
  }
  let rows: FindingContainerRow[] = containersNowAt(finding);
  if (rows.length === 0 && finding.containerId != null) rows = containersByIds([finding.containerId]);
  return {
    basis: "inventory",
    rows: rows.map((row) => ({
      id: row.id,
      label: row.label,
      content: row.substanceName ?? row.mixtureName ?? "—",
      amountText: formatTraceValue(row.amount, row.amountUnit),
      state: stateLabel(row.state),
      ownerName: row.ownerName,
      since: null,
      href: `/inventory/${row.id}`,
    })),
  };
}
