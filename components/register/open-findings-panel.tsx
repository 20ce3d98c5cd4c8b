import Link from "next/link";
import type { ReactNode } from "react";
import { Card } from "@/components/ui/card";
import { SeverityBadge, SEVERITY_STYLE } from "@/components/ui/severity";
import type { Scenario } from "@/db/enums";
import { formatCount, formatNumber } from "@/lib/format/numbers";
import { SCENARIO_LABELS, STATUS_LABELS } from "@/lib/register/labels";
import { groupByUnit, ratioPercent, registerHrefFor, type FindingPlace, type OpenFindingItem, type OpenFindingsHere } from "@/lib/register/open-findings";

const PLACE_WORDS: Record<FindingPlace["kind"], string> = { room: "this room", unit: "this storage unit", container: "this container" };

/** Shown at once per group; the rest open on demand, so a busy room does not bury the page. */
const FIRST_SHOWN = 6;

function valueText(item: OpenFindingItem): string[] {
  const unit = item.unit ? ` ${item.unit}` : "";
  return [item.value != null ? `value ${formatNumber(item.value)}${unit}` : null, item.limit != null ? `limit ${formatNumber(item.limit)}${unit}` : null].filter((text): text is string => text !== null);
}

function FindingLine({ item }: { item: OpenFindingItem }) {
  const values = valueText(item);
  const ratio = ratioPercent(item.ratio, (n) => formatNumber(n));
  const status = item.status !== "open" ? (STATUS_LABELS[item.status as keyof typeof STATUS_LABELS] ?? item.status) : null;
  return (
    <li className="flex flex-wrap items-start gap-x-3 gap-y-1 py-2.5 first:pt-0 last:pb-0">
      {/* A fixed width lines the titles up whatever the severity's word. */}
      <div className="w-[5.5rem] shrink-0">
        <SeverityBadge severity={item.severity} />
      </div>
      <div className="min-w-0 flex-1">
        <Link href={`/register/${item.id}`} className="text-sm text-accent-800 underline-offset-2 hover:underline">
          {item.title}
        </Link>
        <p className="tabular mt-0.5 text-xs text-ink-600">
          {[...values, ratio ? `${ratio} of the limit` : null, SCENARIO_LABELS[item.scenario as Scenario] ?? item.scenario, status].filter(Boolean).join(" · ")}
        </p>
      </div>
    </li>
  );
}

function HiddenNote({ hidden, place, listed }: { hidden: OpenFindingsHere["hidden"]; place: FindingPlace; listed: boolean }) {
  if (hidden.count === 0 || !hidden.worst) return null;
  const worst = SEVERITY_STYLE[hidden.worst].label.toLowerCase();
  return (
    <p className="mt-3 rounded-md border border-ink-200 bg-ink-50 px-3 py-2 text-xs text-ink-700">
      {formatCount(hidden.count)} {listed ? "more " : ""}open finding{hidden.count === 1 ? "" : "s"} concern{hidden.count === 1 ? "s" : ""} {PLACE_WORDS[place.kind]} (the worst {worst}):{" "}
      {hidden.count === 1 ? "it turns" : "they turn"} on containers or locations of other people, so your register does not list {hidden.count === 1 ? "it" : "them"}. A safety officer
      sees every finding.
    </p>
  );
}

/**
 * "Open findings here": the findings (any status but resolved) that concern a room, a storage unit
 * or a container, worst first, each linking to its page in the register. A room's findings are
 * grouped by where they sit: the room itself, then each unit.
 */
export function OpenFindingsPanel({ here, place, groupUnits = false, note }: { here: OpenFindingsHere; place: FindingPlace; groupUnits?: boolean; note?: ReactNode }) {
  const registerHref = registerHrefFor(place);
  const words = PLACE_WORDS[place.kind];
  const own = here.scope === "own";
  const groups = groupUnits ? groupByUnit(here.items) : [{ storageUnitId: null, unitCode: null, items: here.items }];
  return (
    <Card
      title={`Open findings here${here.items.length ? ` (${formatCount(here.items.length)})` : ""}`}
      action={
        <Link href={registerHref} className="text-xs font-medium text-accent-700 hover:underline">
          {words.charAt(0).toUpperCase() + words.slice(1)} in the register
        </Link>
      }
    >
      {here.items.length === 0 ? (
        <p className="text-sm text-ink-700">
          {own && here.hidden.count > 0 ? `None of your open findings concern ${words}.` : `There are no open findings for ${words}.`}{" "}
          <Link href={registerHref} className="text-accent-700 hover:underline">
            See {words} in the register
          </Link>{" "}
          {own ? "for your findings here that were resolved." : "for its resolved findings and their history."}
        </p>
      ) : (
        <div className="space-y-4">
          {groups.map((group) => (
            <div key={group.storageUnitId ?? "room"}>
              {groupUnits ? (
                <h3 className="mb-2 text-xs font-semibold uppercase tracking-wide text-ink-600">
                  {group.storageUnitId == null ? (
                    "The room as a whole"
                  ) : (
                    <Link href={`/locations/units/${group.storageUnitId}`} className="hover:underline">
                      Unit {group.unitCode}
                    </Link>
                  )}
                </h3>
              ) : null}
              <ul className="divide-y divide-ink-100">
                {group.items.slice(0, FIRST_SHOWN).map((item) => (
                  <FindingLine key={item.id} item={item} />
                ))}
              </ul>
              {group.items.length > FIRST_SHOWN ? (
                <details className="group mt-2">
                  <summary className="cursor-pointer text-sm font-medium text-accent-700 hover:underline">
                    <span className="group-open:hidden">Show</span>
                    <span className="hidden group-open:inline">Hide</span> {formatCount(group.items.length - FIRST_SHOWN)} more
                    {groupUnits ? (group.storageUnitId == null ? " for the room as a whole" : ` in unit ${group.unitCode}`) : ""}
                  </summary>
                  <ul className="mt-2 divide-y divide-ink-100">
                    {group.items.slice(FIRST_SHOWN).map((item) => (
                      <FindingLine key={item.id} item={item} />
                    ))}
                  </ul>
                </details>
              ) : null}
            </div>
          ))}
        </div>
      )}
      {own ? <HiddenNote hidden={here.hidden} place={place} listed={here.items.length > 0} /> : null}
      {note ? <p className="mt-3 text-xs text-ink-600">{note}</p> : null}
    </Card>
  );
}
