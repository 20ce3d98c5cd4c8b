import { renderEmail, type RenderedEmail } from "./layout";

/** What an excursion e-mail needs to say: what happened, where, the peak, and a link to the page. */
export type ExcursionEmailInput = {
  event: "started" | "ended" | "recorded";
  locationLabel: string;
  sensorLabel: string;
  thresholdC: number;
  minDurationMin: number;
  startAt: Date;
  endAt: Date | null;
  peakTempC: number;
  peakAt: Date;
  link: string;
  /** Started excursions on a unit: the projected threshold crossings, earliest first (lib/temperatures/projection.ts). */
  projection?: string[];
  /** "τ = 4 h, …; warming towards 27.0 °C". */
  projectionBasis?: string;
  /** The excursion's own page. */
  projectionLink?: string;
};

export function formatEmailTempC(tempC: number): string {
  return `${tempC.toFixed(1).replace("-", "−")} °C`;
}

export function formatEmailInstant(at: Date): string {
  return `${at.toISOString().slice(0, 16).replace("T", " ")} UTC`;
}

/** 2 h 05 min, 3 d 4 h: durations as people read them on a phone. */
export function formatDurationMin(durationMin: number): string {
  const total = Math.max(0, Math.round(durationMin));
  const days = Math.floor(total / 1440);
  const hours = Math.floor((total % 1440) / 60);
  const minutes = total % 60;
  if (days > 0) return `${days} d ${hours} h`;
  if (hours > 0) return `${hours} h ${String(minutes).padStart(2, "0")} min`;
  return `${minutes} min`;
}

export function excursionEmail(input: ExcursionEmailInput): RenderedEmail {
  const threshold = formatEmailTempC(input.thresholdC);
  const peak = `${formatEmailTempC(input.peakTempC)} at ${formatEmailInstant(input.peakAt)}`;
  const durationMin = input.endAt ? (input.endAt.getTime() - input.startAt.getTime()) / 60_000 : null;
  const caution = {
    kind: "small" as const,
    text: "Check the stored liquids and the equipment before relying on them. Headroom's figures are screening estimates from logger data, not air monitoring; qualified people decide, and local codes and the authority having jurisdiction prevail.",
  };
  if (input.event === "started") {
    return renderEmail(
      `Excursion started: ${input.locationLabel} above ${threshold}`,
      `Temperature excursion at ${input.locationLabel}`,
      [
        {
          kind: "p",
          text: `Sensor ${input.sensorLabel} has read above the excursion threshold of ${threshold} since ${formatEmailInstant(input.startAt)}, for at least the minimum duration of ${formatDurationMin(input.minDurationMin)}. The excursion is still open.`,
        },
        { kind: "p", text: `Highest reading so far: ${peak}.` },
        ...(input.projection?.length
          ? [
              { kind: "p" as const, text: `If it keeps warming${input.projectionBasis ? ` (${input.projectionBasis})` : ""}, its contents cross these thresholds, earliest first:` },
              ...input.projection.map((line) => ({ kind: "small" as const, text: `• ${line}` })),
            ]
          : []),
        { kind: "button", label: input.projection?.length ? "Open the excursion" : "Open the location", href: input.projectionLink ?? input.link },
        { kind: "small", text: "Acknowledge it on the location page with a comment saying what was done. You will receive another message when the temperature is back at or below the threshold." },
        caution,
      ],
    );
  }
  const span = `from ${formatEmailInstant(input.startAt)} to ${formatEmailInstant(input.endAt ?? input.peakAt)}${durationMin == null ? "" : ` (${formatDurationMin(durationMin)})`}`;
  if (input.event === "ended") {
    return renderEmail(
      `Excursion ended: ${input.locationLabel}, peak ${formatEmailTempC(input.peakTempC)}`,
      `Excursion ended at ${input.locationLabel}`,
      [
        { kind: "p", text: `Sensor ${input.sensorLabel} is back at or below the excursion threshold of ${threshold}. The excursion lasted ${span}.` },
        { kind: "p", text: `Peak: ${peak}.` },
        { kind: "button", label: "Open the location", href: input.link },
        caution,
      ],
    );
  }
  return renderEmail(
    `Excursion recorded: ${input.locationLabel}, peak ${formatEmailTempC(input.peakTempC)}`,
    `Past excursion found at ${input.locationLabel}`,
    [
      { kind: "p", text: `Uploaded readings from sensor ${input.sensorLabel} show a period above the excursion threshold of ${threshold} ${span}.` },
      { kind: "p", text: `Peak: ${peak}.` },
      { kind: "button", label: "Open the location", href: input.link },
      caution,
    ],
  );
}

export type DigestExcursionLine = { locationLabel: string; sensorLabel: string; state: string; peakTempC: number; peakAt: Date; link: string };

export function dailyDigestEmail(input: { name: string; dayLabel: string; sections: { heading: string; lines: string[] }[]; link: string }): RenderedEmail {
  const blocks: Parameters<typeof renderEmail>[2] = [{ kind: "p", text: `Hello ${input.name}, this is what happened on the locations you are responsible for in the 24 hours up to ${input.dayLabel}.` }];
  for (const section of input.sections) {
    blocks.push({ kind: "p", text: section.heading });
    for (const line of section.lines) blocks.push({ kind: "small", text: `• ${line}` });
  }
  blocks.push({ kind: "button", label: "Open Headroom", href: input.link });
  blocks.push({ kind: "small", text: "You receive this digest because of the alert choices in your profile. Change them there." });
  return renderEmail(`Headroom daily digest, ${input.dayLabel}`, "Your daily digest", blocks);
}

/** A projected crossing less than an hour away: the second warning of an open excursion. */
export function crossingSoonEmail(input: { locationLabel: string; lines: string[]; first: string; basis: string; latest: string; link: string }): RenderedEmail {
  return renderEmail(
    `Within the hour at ${input.locationLabel}: ${input.first}`,
    `Danger within the hour at ${input.locationLabel}`,
    [
      { kind: "p", text: `${input.locationLabel} is still warming (latest reading ${input.latest}). Projected from its readings (${input.basis}), its contents cross these thresholds within the hour, earliest first:` },
      ...input.lines.map((text) => ({ kind: "small" as const, text: `• ${text}` })),
      { kind: "button", label: "Open the excursion", href: input.link },
      {
        kind: "small",
        text: "Move the contents to a working unit or restore the cooling now. The projection is a screening estimate from one time constant, not air monitoring; qualified people decide, and local codes and the authority having jurisdiction prevail.",
      },
    ],
  );
}
