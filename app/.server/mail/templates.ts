/**
 * Patina's e-mail look, written once: a message is a list of blocks, rendered
 * both as HTML (inline styles, table layout, which mail clients keep) and as
 * plain text with the same content.
 */

export type RenderedMail = { subject: string; html: string; text: string };

export type TableColumn = { label: string; align?: "left" | "right" };

export type MailBlock =
  | { kind: "heading"; text: string }
  | { kind: "paragraph"; text: string }
  | { kind: "button"; href: string; label: string }
  | { kind: "facts"; rows: Array<[label: string, value: string]> }
  | { kind: "table"; caption: string; columns: TableColumn[]; rows: string[][]; empty: string }
  | { kind: "cautions" }
  | { kind: "small"; text: string };

export type MailDocument = {
  subject: string;
  /** Shown by many clients next to the subject. */
  preview: string;
  blocks: MailBlock[];
  /** Footer lines; links as [label, href]. */
  footer?: Array<string | [label: string, href: string]>;
};

const PALETTE = {
  verdigris: "#22604f",
  verdigrisLight: "#d3ebe3",
  paper: "#f7f5ef",
  ink: "#1d2a2b",
  muted: "#5b6b6b",
  line: "#d9dcd3",
  alert: "#b3541e",
} as const;

const FONT = "font-family:'Inter Tight',Segoe UI,Helvetica,Arial,sans-serif;";

/**
 * The usual cautions wherever a message suggests chemical work or opening
 * equipment. Mail shows no dose, so the dose caution stays with the visit
 * form's label amounts.
 */
export const CAUTIONS = [
  "Acid is corrosive: wear eye and skin protection, add acid to water (never water to acid), never mix it with chlorine products, and store them apart.",
  "Draining a pool can let ground water lift the shell, and the discharge may be regulated: check local rules and use a qualified contractor.",
  "Switch off and lock out the pump before opening it or other equipment.",
  "Follow the product label, local codes and licensed practice.",
  "Metal levels here are staining levels from common practice, not health limits.",
] as const;

export function escapeHtml(value: string): string {
  return value
    .replaceAll("&", "&amp;")
    .replaceAll("<", "&lt;")
    .replaceAll(">", "&gt;")
    .replaceAll('"', "&quot;")
    .replaceAll("'", "&#39;");
}

function blockHtml(block: MailBlock): string {
  switch (block.kind) {
    case "heading":
      return `<h2 style="${FONT}margin:24px 0 8px;font-size:17px;line-height:1.3;color:${PALETTE.ink};">${escapeHtml(block.text)}</h2>`;
    case "paragraph":
      return `<p style="${FONT}margin:0 0 12px;font-size:15px;line-height:1.55;color:${PALETTE.ink};">${escapeHtml(block.text)}</p>`;
    case "small":
      return `<p style="${FONT}margin:0 0 12px;font-size:13px;line-height:1.5;color:${PALETTE.muted};">${escapeHtml(block.text)}</p>`;
    case "button":
      return `<table role="presentation" cellpadding="0" cellspacing="0" style="margin:8px 0 16px;"><tr><td style="border-radius:8px;background:${PALETTE.verdigris};">
<a href="${escapeHtml(block.href)}" style="${FONT}display:inline-block;padding:12px 20px;font-size:15px;font-weight:600;color:#ffffff;text-decoration:none;">${escapeHtml(block.label)}</a>
</td></tr></table>
<p style="${FONT}margin:0 0 12px;font-size:12px;color:${PALETTE.muted};word-break:break-all;">Or open this address: ${escapeHtml(block.href)}</p>`;
    case "facts":
      return `<table role="presentation" cellpadding="0" cellspacing="0" style="margin:0 0 16px;border-collapse:collapse;">${block.rows
        .map(
          ([label, value]) =>
            `<tr><td style="${FONT}padding:4px 16px 4px 0;font-size:14px;color:${PALETTE.muted};vertical-align:top;">${escapeHtml(label)}</td><td style="${FONT}padding:4px 0;font-size:14px;font-weight:600;color:${PALETTE.ink};">${escapeHtml(value)}</td></tr>`,
        )
        .join("")}</table>`;
    case "table": {
      if (block.rows.length === 0) {
        return `<p style="${FONT}margin:0 0 12px;font-size:14px;color:${PALETTE.muted};">${escapeHtml(block.empty)}</p>`;
      }
      const cell = (tag: "th" | "td", text: string, column: TableColumn | undefined) =>
        `<${tag}${tag === "th" ? ' scope="col"' : ""} style="${FONT}padding:6px 8px;font-size:13px;text-align:${column?.align ?? "left"};border-bottom:1px solid ${PALETTE.line};${tag === "th" ? `color:${PALETTE.muted};font-weight:600;` : `color:${PALETTE.ink};`}">${escapeHtml(text)}</${tag}>`;
      return `<table style="width:100%;margin:0 0 16px;border-collapse:collapse;background:#ffffff;">
<caption style="${FONT}text-align:left;padding:0 0 6px;font-size:13px;color:${PALETTE.muted};">${escapeHtml(block.caption)}</caption>
<thead><tr>${block.columns.map((c) => cell("th", c.label, c)).join("")}</tr></thead>
<tbody>${block.rows.map((row) => `<tr>${row.map((value, i) => cell("td", value, block.columns[i])).join("")}</tr>`).join("\n")}</tbody>
</table>`;
    }
    case "cautions":
      return `<table role="presentation" cellpadding="0" cellspacing="0" style="width:100%;margin:16px 0;border-collapse:collapse;"><tr><td style="${FONT}padding:12px 14px;border-left:4px solid ${PALETTE.alert};background:#fbf3ec;font-size:13px;line-height:1.5;color:${PALETTE.ink};">
<strong>Before any chemical work</strong><ul style="margin:6px 0 0;padding-left:18px;">${CAUTIONS.map((c) => `<li>${escapeHtml(c)}</li>`).join("")}</ul>
</td></tr></table>`;
  }
}

function blockText(block: MailBlock): string {
  switch (block.kind) {
    case "heading":
      return `${block.text}\n${"-".repeat(Math.min(block.text.length, 60))}`;
    case "paragraph":
    case "small":
      return block.text;
    case "button":
      return `${block.label}: ${block.href}`;
    case "facts": {
      const width = Math.max(...block.rows.map(([label]) => label.length));
      return block.rows.map(([label, value]) => `${`${label}:`.padEnd(width + 2)}${value}`).join("\n");
    }
    case "table": {
      if (block.rows.length === 0) return block.empty;
      const widths = block.columns.map((c, i) => Math.max(c.label.length, ...block.rows.map((r) => (r[i] ?? "").length)));
      const line = (values: string[]) =>
        values
          .map((v, i) => (block.columns[i]?.align === "right" ? v.padStart(widths[i]!) : v.padEnd(widths[i]!)))
          .join("  ")
          .trimEnd();
      return [block.caption, line(block.columns.map((c) => c.label)), ...block.rows.map(line)].join("\n");
    }
    case "cautions":
      return ["Before any chemical work:", ...CAUTIONS.map((c) => `* ${c}`)].join("\n");
  }
}

export function renderMail(doc: MailDocument): RenderedMail {
  const footer = doc.footer ?? [];
  const footerHtml = footer
    .map((item) =>
      typeof item === "string"
        ? escapeHtml(item)
        : `<a href="${escapeHtml(item[1])}" style="color:${PALETTE.verdigris};">${escapeHtml(item[0])}</a>`,
    )
    .join("<br>");
  const html = `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1"><title>${escapeHtml(doc.subject)}</title></head>
<body style="margin:0;padding:0;background:${PALETTE.paper};">
<span style="display:none;max-height:0;overflow:hidden;">${escapeHtml(doc.preview)}</span>
<table role="presentation" width="100%" cellpadding="0" cellspacing="0" style="background:${PALETTE.paper};"><tr><td align="center" style="padding:24px 12px;">
<table role="presentation" width="100%" cellpadding="0" cellspacing="0" style="max-width:600px;">
<tr><td style="${FONT}padding:0 0 12px;font-size:18px;font-weight:700;color:${PALETTE.verdigris};">
<span style="display:inline-block;width:14px;height:14px;border-radius:7px;background:${PALETTE.verdigris};vertical-align:middle;margin-right:8px;"></span>Patina</td></tr>
<tr><td style="padding:24px;background:#ffffff;border:1px solid ${PALETTE.line};border-top:4px solid ${PALETTE.verdigris};border-radius:10px;">
${doc.blocks.map(blockHtml).join("\n")}
</td></tr>
<tr><td style="${FONT}padding:16px 4px;font-size:12px;line-height:1.6;color:${PALETTE.muted};">${footerHtml}</td></tr>
</table></td></tr></table></body></html>`;
  const footerText = footer.map((item) => (typeof item === "string" ? item : `${item[0]}: ${item[1]}`));
  const text = [
    doc.blocks.map(blockText).join("\n\n"),
    ...(footerText.length > 0 ? ["--", footerText.join("\n")] : []),
  ].join("\n\n");
  return { subject: doc.subject, html, text: `${text}\n` };
}

export function absoluteUrl(baseUrl: string, path: string): string {
  return new URL(path, baseUrl).toString();
}
