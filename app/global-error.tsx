"use client";

export default function GlobalError({ reset }: { error: Error; reset: () => void }) {
  return (
    <html lang="en">
      <body style={{ fontFamily: "system-ui, sans-serif", padding: "4rem 1.5rem", textAlign: "center", color: "#1d2833" }}>
        <h1 style={{ fontSize: "1.5rem" }}>Headroom could not load this page</h1>
        <p style={{ color: "#56687a" }}>The error was logged. Try again; if it persists, tell your administrator.</p>
        <button onClick={reset} style={{ marginTop: "1.5rem", padding: "0.5rem 1rem" }}>
          Try again
        </button>
      </body>
    </html>
  );
}
