import { Card } from "@/components/ui/card";
import type { BrokenBottle } from "@/lib/assessment/rules/broken-bottle";
import { brokenBottleSentence } from "@/lib/assessment/rules/time-to-danger";

/** A closed unit's "if a bottle breaks inside" times: the largest bottle of each volatile liquid with an LFL. */
export function BrokenBottlesCard({ bottles, unitCode }: { bottles: BrokenBottle[]; unitCode: string }) {
  if (bottles.length === 0) return null;
  return (
    <Card title="If a bottle breaks inside">
      <p className="mb-3 text-sm text-ink-700">
        How soon the air in {unitCode} would reach 25 % of the LFL and the LFL if the largest bottle of each liquid broke inside with the door
        closed: pool evaporation into still air (US EPA RMP Eq. D-1), slowed as the air saturates, at the unit&apos;s in-control worst case. A
        screening estimate, not air monitoring; qualified people decide.
      </p>
      <ul className="space-y-1.5 text-sm text-ink-900">
        {bottles.map((bottle) => (
          <li key={bottle.containerId}>{brokenBottleSentence(bottle)}</li>
        ))}
      </ul>
    </Card>
  );
}
