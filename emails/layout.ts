/** Shared frame for Headroom's e-mails: plain HTML with inline styles, and a plain-text twin. */
export type RenderedEmail = { subject: string; html: string; text: string };

export function escapeHtml(value: string): string {
  return value
    .replaceAll("&", "&amp;")
    .replaceAll("<", "&lt;")
    .replaceAll(">", "&gt;")
    .replaceAll('"', "&quot;")
    .replaceAll("'", "&#39;");
}

type Block = { kind: "p"; text: string } | { kind: "button"; label: string; href: string } | { kind: "small"; text: string };

export function renderEmail(subject: string, heading: string, blocks: Block[]): RenderedEmail {
  const htmlBlocks = blocks
    .map((block) => {
      if (block.kind === "p") return `<p style="margin:0 0 16px;line-height:1.5">${escapeHtml(block.text)}</p>`;
      if (block.kind === "small")
        return `<p style="margin:0 0 12px;line-height:1.5;font-size:13px;color:#52606d">${escapeHtml(block.text)}</p>`;
      return `<p style="margin:24px 0"><a href="${escapeHtml(block.href)}" style="background:#0b5d6b;color:#ffffff;text-decoration:none;padding:10px 18px;border-radius:6px;font-weight:600;display:inline-block">${escapeHtml(block.label)}</a></p><p style="margin:0 0 16px;font-size:13px;color:#52606d;word-break:break-all">${escapeHtml(block.href)}</p>`;
    })
    .join("\n");
  const html = `<!doctype html><html><body style="margin:0;background:#f4f6f8;font-family:system-ui,-apple-system,'Segoe UI',sans-serif;color:#1f2933">
<div style="max-width:560px;margin:0 auto;padding:32px 24px">
<p style="margin:0 0 24px;font-weight:700;letter-spacing:0.02em;color:#0b5d6b">Headroom</p>
<div style="background:#ffffff;border:1px solid #d9e2ec;border-radius:8px;padding:28px">
<h1 style="margin:0 0 16px;font-size:20px">${escapeHtml(heading)}</h1>
${htmlBlocks}
</div>
<p style="margin:24px 0 0;font-size:12px;color:#7b8794">Sent by Headroom, the vapor-hazard register. You receive this because of your account on this installation.</p>
</div></body></html>`;
  const text = [
    heading,
    "",
    ...blocks.map((block) => (block.kind === "button" ? `${block.label}: ${block.href}` : block.text)),
    "",
    "-- Sent by Headroom, the vapor-hazard register.",
  ].join("\n");
  return { subject, html, text };
}
