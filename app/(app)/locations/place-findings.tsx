import { OpenFindingsPanel } from "@/components/register/open-findings-panel";
import { openFindingsInRoom, openFindingsInUnit, openFindingsOfContainer } from "@/db/queries/location-findings";
import { scopeFor } from "@/lib/auth/permissions";
import type { SessionUser } from "@/lib/auth/session";
import type { FindingPlace } from "@/lib/register/open-findings";

const CONTAINER_NOTE =
  "Listed are the findings that name this container and those about its contents in its storage unit and its room. Findings about a whole location, such as quantity limits or oxygen, are on the unit and room pages.";

/**
 * "Open findings here" for a room (its units' findings included), a storage unit or a container,
 * in the reader's scope of the register; nothing for a role that may not read the register.
 */
export function PlaceFindings({ user, place }: { user: SessionUser; place: FindingPlace }) {
  const scope = scopeFor(user.role, "findings.read");
  if (!scope) return null;
  if (place.kind === "room") return <OpenFindingsPanel here={openFindingsInRoom(user, scope, place.roomId)} place={place} groupUnits />;
  if (place.kind === "unit") return <OpenFindingsPanel here={openFindingsInUnit(user, scope, place.storageUnitId)} place={place} />;
  const here = openFindingsOfContainer(user, scope, place.containerId);
  return here ? <OpenFindingsPanel here={here} place={place} note={CONTAINER_NOTE} /> : null;
}
