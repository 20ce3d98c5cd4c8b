import type { Severity } from "@/db/enums";
import { SeverityBadge } from "@/components/ui/severity";
import type { ShownStep } from "@/lib/register/trace-steps";
import { Formula, ResultLine, SourceNote } from "./bits";

const SEVERITIES = new Set(["critical", "high", "moderate", "low"]);

type StepLook = { tone: "plain" | "key"; strong: boolean };

const PLAIN: StepLook = { tone: "plain", strong: false };
const KEY: StepLook = { tone: "key", strong: true };

/**
 * How a step stands out by its kind: the vapor pressure, the sums and the ratio to a limit are the
 * key results; the enclosure bound's last step (the smaller of the two) is framed but not bold.
 */
function lookOf(step: ShownStep): StepLook {
  switch (step.kind) {
    case "vapor-pressure":
    case "lfl-sum":
    case "ratio":
      return KEY;
    case "enclosure-bound":
      return step.result?.symbol === "C_max" ? { tone: "key", strong: false } : PLAIN;
    default:
      return PLAIN;
  }
}

/** The result of the severity step: the grade as a badge, and where its thresholds come from. */
function SeverityResult({ step }: { step: ShownStep }) {
  const severity = step.severity && SEVERITIES.has(step.severity) ? (step.severity as Severity) : null;
  return (
    <>
      <p className="mt-1 flex flex-wrap items-center gap-2 text-sm">
        → Severity: {severity ? <SeverityBadge severity={severity} /> : <span className="font-semibold">{step.result?.text ?? "—"}</span>}
      </p>
      {step.result && (step.result.source || step.result.citation !== null) ? (
        <p className="mt-1 text-xs text-ink-500">
          Thresholds: <SourceNote source={step.result.source} citation={step.result.citation} />
        </p>
      ) : null}
    </>
  );
}

/** One step, drawn by its kind: its number, what it does, the formula with the numbers put in, the result. */
export function TraceStepItem({ step, number }: { step: ShownStep; number: number }) {
  const look = lookOf(step);
  return (
    <li className={`rounded-md px-3 py-2 ${look.tone === "key" ? "border border-accent-200 bg-accent-50" : "bg-ink-50"}`}>
      <span className="tabular mr-2 text-xs font-semibold text-ink-500">Step {number}</span>
      <span className={look.strong ? "text-sm font-medium text-ink-900" : "text-sm text-ink-800"}>{step.description}</span>
      <Formula formula={step.formula} substituted={step.substituted} />
      {step.kind === "severity" ? <SeverityResult step={step} /> : <ResultLine value={step.result} />}
    </li>
  );
}

export function StepList({ steps }: { steps: ShownStep[] }) {
  if (steps.length === 0) return null;
  return (
    <ol className="space-y-2">
      {steps.map((step, i) => (
        <TraceStepItem key={i} step={step} number={i + 1} />
      ))}
    </ol>
  );
}
