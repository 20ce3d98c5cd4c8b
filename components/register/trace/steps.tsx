import type { ReactNode } from "react";
import type { Severity } from "@/db/enums";
import { SeverityBadge } from "@/components/ui/severity";
import type { ShownStep } from "@/lib/register/trace-steps";
import { Formula, ResultLine, SourceNote } from "./bits";

const SEVERITIES = new Set(["critical", "high", "moderate", "low"]);

function StepFrame({ number, tone = "plain", children }: { number: number; tone?: "plain" | "key"; children: ReactNode }) {
  return (
    <li className={`rounded-md px-3 py-2 ${tone === "key" ? "border border-accent-200 bg-accent-50" : "bg-ink-50"}`}>
      <span className="tabular mr-2 text-xs font-semibold text-ink-500">Step {number}</span>
      {children}
    </li>
  );
}

/** The vapor-pressure equation with the temperature put in, and Psat. */
export function VaporPressureStep({ step, number }: { step: ShownStep; number: number }) {
  return (
    <StepFrame number={number} tone="key">
      <span className="text-sm font-medium text-ink-900">{step.description}</span>
      <Formula formula={step.formula} substituted={step.substituted} />
      <ResultLine value={step.result} />
    </StepFrame>
  );
}

/** ppm, mg/m³, the mole fraction and the molar volume: the concentration steps. */
export function ConcentrationStep({ step, number }: { step: ShownStep; number: number }) {
  return (
    <StepFrame number={number}>
      <span className="text-sm text-ink-800">{step.description}</span>
      <Formula formula={step.formula} substituted={step.substituted} />
      <ResultLine value={step.result} />
    </StepFrame>
  );
}

/** The enclosure bound's steps: the releasable mass, the all-evaporated concentration, the smaller of the two. */
export function BoundStep({ step, number }: { step: ShownStep; number: number }) {
  return (
    <StepFrame number={number} tone={step.result?.symbol === "C_max" ? "key" : "plain"}>
      <span className="text-sm text-ink-800">{step.description}</span>
      <Formula formula={step.formula} substituted={step.substituted} />
      <ResultLine value={step.result} />
    </StepFrame>
  );
}

/** A sum of shares (Le Chatelier's additive form) or a ratio to a limit. */
export function SumStep({ step, number }: { step: ShownStep; number: number }) {
  return (
    <StepFrame number={number} tone="key">
      <span className="text-sm font-medium text-ink-900">{step.description}</span>
      <Formula formula={step.formula} substituted={step.substituted} />
      <ResultLine value={step.result} />
    </StepFrame>
  );
}

/** The thresholds applied and the severity they give, with the thresholds' source. */
export function SeverityStep({ step, number }: { step: ShownStep; number: number }) {
  const severity = step.severity && SEVERITIES.has(step.severity) ? (step.severity as Severity) : null;
  return (
    <StepFrame number={number}>
      <span className="text-sm text-ink-800">{step.description}</span>
      <Formula formula={step.formula} substituted={step.substituted} />
      <p className="mt-1 flex flex-wrap items-center gap-2 text-sm">
        → Severity: {severity ? <SeverityBadge severity={severity} /> : <span className="font-semibold">{step.result?.text ?? "—"}</span>}
      </p>
      {step.result && (step.result.source || step.result.citation !== null) ? (
        <p className="mt-1 text-xs text-ink-500">
          Thresholds: <SourceNote source={step.result.source} citation={step.result.citation} />
        </p>
      ) : null}
    </StepFrame>
  );
}

export function GenericStep({ step, number }: { step: ShownStep; number: number }) {
  return (
    <StepFrame number={number}>
      <span className="text-sm text-ink-800">{step.description}</span>
      <Formula formula={step.formula} substituted={step.substituted} />
      <ResultLine value={step.result} />
    </StepFrame>
  );
}

/** One step, drawn by its kind. */
export function TraceStepItem({ step, number }: { step: ShownStep; number: number }) {
  switch (step.kind) {
    case "vapor-pressure":
      return <VaporPressureStep step={step} number={number} />;
    case "mole-fraction":
    case "concentration":
    case "molar-volume":
    case "trouton":
      return <ConcentrationStep step={step} number={number} />;
    case "enclosure-bound":
      return <BoundStep step={step} number={number} />;
    case "lfl-sum":
    case "ratio":
      return <SumStep step={step} number={number} />;
    case "severity":
      return <SeverityStep step={step} number={number} />;
    default:
      return <GenericStep step={step} number={number} />;
  }
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
