import fs from "node:fs";
import { seededRandom } from "./stats";

/**
 * A refrigerator logger's export for the benchmarks, written as a stream: an information block, then
 * Date;Time;Temperature;Unit;Serial with dd.mm.yyyy dates, 24-hour local times in `timeZone`
 * (both daylight-saving changes of the year inside, the repeated hour included), decimal commas,
 * every 30 s from 1 January 2025 (in the past: readings ahead of the server's clock are refused).
 * Invented data: 4–5 °C with noise, short door openings, and one warm spell above 8 °C for
 * 40–100 min about every two weeks.
 */
export const LOGGER_STEP_MS = 30_000;

export async function writeLoggerCsv(
  file: string,
  { rows, device, timeZone = "Europe/Berlin", seed = 20_260_101 }: { rows: number; device: string; timeZone?: string; seed?: number },
): Promise<{ bytes: number }> {
  const { zoneOffsetMs } = await import("@/lib/temperatures/csv");
  const random = seededRandom(seed);
  const startMs = Date.parse("2024-12-31T23:00:00Z"); // 1 January 2025 00:00 in Berlin
  const offsets = new Map<number, number>(); // per UTC hour; zones change on whole UTC hours
  const offsetAt = (atMs: number) => {
    const hour = Math.floor(atMs / 3_600_000);
    let offset = offsets.get(hour);
    if (offset === undefined) offsets.set(hour, (offset = zoneOffsetMs(hour * 3_600_000, timeZone)));
    return offset;
  };
  const two = (n: number) => (n < 10 ? `0${n}` : String(n));
  let warmUntil = -1;
  let warmPeakC = 0;
  let doorUntil = -1;
  const out = fs.createWriteStream(file, { highWaterMark: 1024 * 1024 });
  const write = (text: string) => (out.write(text) ? Promise.resolve() : new Promise<void>((resolve) => out.once("drain", () => resolve())));
  await write(`Device;Refrigerator logger\r\nSerial number;${device}\r\nCalibration date;05.01.2025\r\n\r\nDate;Time;Temperature;Unit;Serial\r\n`);
  let batch = "";
  for (let i = 0; i < rows; i++) {
    const atMs = startMs + i * LOGGER_STEP_MS;
    if (i > warmUntil && random() < 1 / 40_000) {
      warmUntil = i + 80 + Math.floor(random() * 120); // 40–100 min
      warmPeakC = 9 + random() * 6;
    }
    if (i > doorUntil && random() < 1 / 3_000) doorUntil = i + 4 + Math.floor(random() * 12); // 2–8 min
    let tempC = 4.5 + 0.3 * Math.sin((2 * Math.PI * i) / 2880) + (random() - 0.5) * 0.4;
    if (i <= warmUntil) tempC = warmPeakC - random() * 0.5;
    else if (i <= doorUntil) tempC = 8.5 + random() * 2;
    const wall = new Date(atMs + offsetAt(atMs));
    const tempText = tempC.toFixed(2).replace(".", ",");
    batch += `${two(wall.getUTCDate())}.${two(wall.getUTCMonth() + 1)}.${wall.getUTCFullYear()};${two(wall.getUTCHours())}:${two(wall.getUTCMinutes())}:${two(wall.getUTCSeconds())};${tempText};°C;${device}\r\n`;
    if (batch.length > 256 * 1024) {
      await write(batch);
      batch = "";
    }
  }
  await write(batch);
  await new Promise<void>((resolve, reject) => out.end((error?: Error | null) => (error ? reject(error) : resolve())));
  return { bytes: fs.statSync(file).size };
}
