/**
 * A browser's User-Agent as a person reads it: "Firefox 133 on Windows", "Safari on iPhone".
 * Only the common browsers and systems are named; anything else shows as its first word.
 */
const BROWSERS: ReadonlyArray<[RegExp, string]> = [
  [/Edg(?:e|A|iOS)?\/(\d+)/, "Edge"],
  [/OPR\/(\d+)/, "Opera"],
  [/Firefox\/(\d+)/, "Firefox"],
  [/FxiOS\/(\d+)/, "Firefox"],
  [/CriOS\/(\d+)/, "Chrome"],
  [/Chrom(?:e|ium)\/(\d+)/, "Chrome"],
  [/Version\/(\d+)[.\d]* (?:Mobile\/\S+ )?Safari\//, "Safari"],
];

const SYSTEMS: ReadonlyArray<[RegExp, string]> = [
  [/iPhone/, "iPhone"],
  [/iPad/, "iPad"],
  [/Android/, "Android"],
  [/CrOS/, "ChromeOS"],
  [/Windows/, "Windows"],
  [/Mac OS X|Macintosh/, "macOS"],
  [/Linux/, "Linux"],
];

export function describeUserAgent(userAgent: string | null | undefined): string {
  const ua = userAgent?.trim();
  if (!ua) return "Unknown browser";
  let browser: string | null = null;
  for (const [pattern, name] of BROWSERS) {
    const match = pattern.exec(ua);
    if (match) {
      browser = match[1] ? `${name} ${match[1]}` : name;
      break;
    }
  }
  const system = SYSTEMS.find(([pattern]) => pattern.test(ua))?.[1] ?? null;
  if (browser && system) return `${browser} on ${system}`;
  if (browser) return browser;
  const first = ua.split(/[\s/]/)[0].slice(0, 40);
  return system ? `${first} on ${system}` : first;
}
