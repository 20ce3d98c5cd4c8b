import { Diamond, Info, OctagonExclamationPoint, TriangleExclamationPoint, type LucideIcon } from "lucide-react";
import type { Severity } from "@/db/enums";

/** Severity is always a word, an icon and a colour together, so it reads without colour and in print. */
export const SEVERITY_STYLE: Record<Severity, { label: string; icon: LucideIcon; text: string; bg: string; border: string }> = {
  critical: { label: "Critical", icon: OctagonExclamationPoint, text: "text-sev-critical", bg: "bg-sev-critical-bg", border: "border-sev-critical/40" },
  high: { label: "High", icon: TriangleExclamationPoint, text: "text-sev-high", bg: "bg-sev-high-bg", border: "border-sev-high/40" },
  moderate: { label: "Moderate", icon: Diamond, text: "text-sev-moderate", bg: "bg-sev-moderate-bg", border: "border-sev-moderate/40" },
  low: { label: "Low", icon: Info, text: "text-sev-low", bg: "bg-sev-low-bg", border: "border-sev-low/30" },
};

export function SeverityBadge({ severity }: { severity: Severity }) {
  const style = SEVERITY_STYLE[severity];
  const Icon = style.icon;
  return (
    <span className={`inline-flex items-center gap-1 rounded border px-1.5 py-0.5 text-xs font-semibold ${style.text} ${style.bg} ${style.border}`}>
      <Icon aria-hidden="true" className="size-3.5" strokeWidth={2.25} />
      {style.label}
    </span>
  );
}
