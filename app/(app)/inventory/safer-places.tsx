"use client";
import { CircleCheck } from "lucide-react";
import Link from "next/link";
import { buttonClass } from "@/components/ui/button";
import { SeverityBadge } from "@/components/ui/severity";
import type { Severity } from "@/db/enums";

/** One place of the storage planner (GET /api/v1/storage-plan), as the screens read it. */
export type SaferPlace = {
  storageUnitId: number;
  code: string;
  name: string;
  roomCode: string;
  siteName: string;
  verdict: "raises" | "already_flagged" | "no_findings";
  worstSeverity: Severity | null;
  nearness: "same_room" | "same_site" | "other_site";
  reason: string;
};

const NEARNESS: Record<SaferPlace["nearness"], string> = { same_room: "same room", same_site: "same site", other_site: "another site" };

/** "Nothing raised" for a place where nothing about it would be flagged, else the worst severity there. */
export function PlaceBadge({ place }: { place: Pick<SaferPlace, "verdict" | "worstSeverity"> }) {
  if (place.verdict === "no_findings" || !place.worstSeverity) {
    return (
      <span className="inline-flex items-center gap-1 rounded border border-ink-200 bg-white px-1.5 py-0.5 text-xs font-semibold text-ok">
        <CircleCheck aria-hidden="true" className="size-3.5" strokeWidth={2.25} />
        Nothing raised
      </span>
    );
  }
  return <SeverityBadge severity={place.worstSeverity} />;
}

/**
 * "Safer places nearby": the what-if's alternatives, each with its badge, code, room and reason,
 * and one click to choose it (`onChoose` sets the form's or dialog's unit, which re-runs the
 * what-if) or, where the unit is not chosen here, a link (`hrefFor`, e.g. the container's Move).
 */
export function SaferPlaces({ places, onChoose, hrefFor }: { places: readonly SaferPlace[]; onChoose?: (unitId: number) => void; hrefFor?: (unitId: number) => string }) {
  if (places.length === 0) return null;
  return (
    <div className="space-y-1.5" data-testid="safer-places">
      <h3 className="text-xs font-semibold tracking-wide text-ink-700 uppercase">Safer places nearby</h3>
      <ul className="space-y-2">
        {places.map((place) => (
          <li key={place.storageUnitId} className="flex flex-wrap items-center gap-2 rounded-md border border-ink-200 bg-white px-3 py-2">
            <PlaceBadge place={place} />
            <div className="min-w-0 flex-1">
              <p className="font-medium text-ink-900">
                {place.code} <span className="font-normal text-ink-600">· room {place.roomCode} ({NEARNESS[place.nearness]})</span>
              </p>
              <p className="text-xs text-ink-700">{place.reason}</p>
            </div>
            {onChoose ? (
              <button type="button" className={buttonClass("secondary", "sm")} onClick={() => onChoose(place.storageUnitId)} aria-label={`Choose ${place.code} in room ${place.roomCode}`}>
                Choose
              </button>
            ) : hrefFor ? (
              <Link href={hrefFor(place.storageUnitId)} className={buttonClass("secondary", "sm")} aria-label={`Move here: ${place.code} in room ${place.roomCode}`}>
                Move here…
              </Link>
            ) : null}
          </li>
        ))}
      </ul>
    </div>
  );
}
