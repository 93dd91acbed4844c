import type { StoredMessage } from "./store";

export const INBOX_TITLE = "Emberwright mail catcher (local)";

/** Escapes text for HTML element content and double- or single-quoted attribute values. */
export function escapeHtml(value: string): string {
  return value
    .replace(/&/g, "&amp;")
    .replace(/</g, "&lt;")
    .replace(/>/g, "&gt;")
    .replace(/"/g, "&quot;")
    .replace(/'/g, "&#39;");
}

/** "2026-12-02 14:03:11 UTC": the server has no idea of the reader's zone, so say which one it is. */
function formatTime(iso: string): string {
  const date = new Date(iso);
  if (Number.isNaN(date.getTime())) return iso;
  return `${date.toISOString().slice(0, 19).replace("T", " ")} UTC`;
}

/** Decimal units, one decimal place above 1 kB. */
export function formatBytes(size: number): string {
  if (size < 1000) return `${size} B`;
  if (size < 1_000_000) return `${(size / 1000).toFixed(1)} kB`;
  return `${(size / 1_000_000).toFixed(1)} MB`;
}

const STYLES = `
  :root {
    --paper: #f6f1ea; --card: #fffdf9; --ink: #2e2620; --muted: #76685c; --line: #e2d8cc;
    --ember: #b4501f; --ember-soft: #f3e0d2; --ash: #ece5dc;
  }
  * { box-sizing: border-box; }
  body {
    margin: 0; background: var(--paper); color: var(--ink);
    font: 15px/1.5 Nunito, "Nunito Sans", ui-rounded, "SF Pro Rounded", system-ui, -apple-system, "Segoe UI", Roboto, sans-serif;
  }
  header.bar { background: var(--ink); color: #f8efe6; padding: 14px 24px; display: flex; gap: 16px; align-items: baseline; flex-wrap: wrap; }
  header.bar a { color: inherit; text-decoration: none; font-weight: 700; font-size: 17px; }
  header.bar .hint { color: #cdbfb2; font-size: 13px; }
  main { max-width: 1040px; margin: 0 auto; padding: 24px; }
  h1 { font-size: 22px; margin: 0 0 16px; overflow-wrap: anywhere; }
  .card { background: var(--card); border: 1px solid var(--line); border-radius: 12px; overflow: hidden; }
  table { width: 100%; border-collapse: collapse; }
  th, td { text-align: left; padding: 10px 14px; border-bottom: 1px solid var(--line); vertical-align: top; }
  th { font-size: 12px; text-transform: uppercase; letter-spacing: .06em; color: var(--muted); background: var(--ash); }
  tr:last-child td { border-bottom: 0; }
  td.time { white-space: nowrap; color: var(--muted); font-variant-numeric: tabular-nums; }
  td a { color: var(--ink); font-weight: 600; text-decoration: none; }
  td a:hover { color: var(--ember); text-decoration: underline; }
  .pill { display: inline-block; background: var(--ember-soft); color: var(--ember); border-radius: 999px; padding: 0 8px; font-size: 12px; font-weight: 700; margin-left: 6px; }
  .empty { padding: 32px; text-align: center; color: var(--muted); }
  .banner { background: #fbe3d6; border: 1px solid #e9b79c; color: #7a2e0c; border-radius: 10px; padding: 10px 14px; margin-bottom: 16px; }
  dl { display: grid; grid-template-columns: max-content 1fr; gap: 6px 18px; margin: 0; padding: 16px 18px; }
  dt { color: var(--muted); font-weight: 600; }
  dd { margin: 0; overflow-wrap: anywhere; }
  h2 { font-size: 14px; text-transform: uppercase; letter-spacing: .06em; color: var(--muted); margin: 24px 0 8px; }
  iframe { width: 100%; height: 520px; border: 0; background: #fff; display: block; resize: vertical; }
  pre { margin: 0; padding: 16px 18px; white-space: pre-wrap; overflow-wrap: anywhere; font: 13px/1.55 ui-monospace, "SFMono-Regular", Menlo, Consolas, monospace; }
  ul.files { list-style: none; margin: 0; padding: 6px 0; }
  ul.files li { padding: 8px 18px; }
  ul.files a { color: var(--ember); font-weight: 700; }
  .muted { color: var(--muted); }
  a.back { color: var(--ember); font-weight: 600; }
`;

function renderPage(title: string, body: string, apiUrl: string): string {
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(title)}</title>
<style>${STYLES}</style>
</head>
<body>
<header class="bar"><a href="/">${escapeHtml(INBOX_TITLE)}</a><span class="hint">Nothing here leaves this machine. API: RESEND_BASE_URL=${escapeHtml(apiUrl)}</span></header>
<main>
${body}
</main>
</body>
</html>
`;
}

function recipientsLine(message: StoredMessage): string {
  return message.to.join(", ");
}

export interface FailureSummary {
  isActive: boolean;
  description: string;
}

/** The list of caught messages, newest first. */
export function renderInboxPage(messages: StoredMessage[], apiUrl: string, failure: FailureSummary): string {
  const banner = failure.isActive
    ? `<p class="banner" role="status">Sends are failing on purpose: ${escapeHtml(failure.description)}. POST /_fake/recover ends it.</p>`
    : "";
  const rows = messages
    .map((message) => {
      const files = message.attachments.length
        ? `<span class="pill">${message.attachments.length} ${message.attachments.length === 1 ? "file" : "files"}</span>`
        : "";
      return `<tr>
  <td class="time"><time datetime="${escapeHtml(message.created_at)}">${escapeHtml(formatTime(message.created_at))}</time></td>
  <td>${escapeHtml(recipientsLine(message))}</td>
  <td><a href="/m/${encodeURIComponent(message.id)}">${escapeHtml(message.subject)}</a>${files}</td>
</tr>`;
    })
    .join("\n");
  const table = messages.length
    ? `<table>
<thead><tr><th scope="col">Time</th><th scope="col">To</th><th scope="col">Subject</th></tr></thead>
<tbody>
${rows}
</tbody>
</table>`
    : `<p class="empty">No messages yet. Every e-mail the app sends through the resend SDK to ${escapeHtml(apiUrl)} shows up here.</p>`;
  const count = `${messages.length} ${messages.length === 1 ? "message" : "messages"}`;
  return renderPage(
    INBOX_TITLE,
    `${banner}<h1>Inbox <span class="muted">(${count})</span></h1>
<div class="card">
${table}
</div>
<p class="muted"><a class="back" href="/">Refresh</a></p>`,
    apiUrl,
  );
}

function definition(term: string, values: string[]): string {
  if (values.length === 0) return "";
  return `<dt>${escapeHtml(term)}</dt><dd>${values.map(escapeHtml).join(", ")}</dd>`;
}

/** One message: headers, the HTML part in a script-less sandbox, the text part, attachment links. */
export function renderMessagePage(message: StoredMessage, apiUrl: string): string {
  const headerRows = [
    definition("From", [message.from]),
    definition("To", message.to),
    definition("Cc", message.cc),
    definition("Bcc", message.bcc),
    definition("Reply-To", message.reply_to),
    definition("Subject", [message.subject]),
    definition("Date", [formatTime(message.created_at)]),
    definition("Scheduled for", message.scheduled_at ? [message.scheduled_at] : []),
    definition("Message id", [message.id]),
    definition("Idempotency key", message.idempotency_key ? [message.idempotency_key] : []),
    definition(
      "Tags",
      message.tags.map((tag) => `${tag.name}=${tag.value}`),
    ),
    ...Object.entries(message.headers).map(([name, value]) => definition(name, [value])),
  ].join("\n");

  // sandbox="" gives the frame an opaque origin with scripts, forms, popups and top navigation all off,
  // so whatever HTML the app produced cannot run or reach this page.
  const htmlPart = message.html
    ? `<h2>HTML part</h2>
<div class="card"><iframe title="HTML part of the message" sandbox="" referrerpolicy="no-referrer" srcdoc="${escapeHtml(message.html)}"></iframe></div>`
    : `<h2>HTML part</h2><p class="muted">This message has no HTML part.</p>`;

  const textPart = message.text
    ? `<h2>Plain-text part</h2><div class="card"><pre>${escapeHtml(message.text)}</pre></div>`
    : `<h2>Plain-text part</h2><p class="muted">This message has no plain-text part.</p>`;

  const files = message.attachments.length
    ? `<h2>Attachments</h2><div class="card"><ul class="files">
${message.attachments
  .map((attachment, index) => {
    const label = `${escapeHtml(attachment.filename)}</a> <span class="muted">${escapeHtml(attachment.contentType)}, ${formatBytes(attachment.size)}</span>`;
    const remote = attachment.path
      ? ` <span class="muted">(remote path, not fetched: ${escapeHtml(attachment.path)})</span>`
      : "";
    return `<li><a href="/m/${encodeURIComponent(message.id)}/attachments/${index}" download>${label}${remote}</li>`;
  })
  .join("\n")}
</ul></div>`
    : "";

  return renderPage(
    `${message.subject} · ${INBOX_TITLE}`,
    `<p><a class="back" href="/">← Inbox</a></p>
<h1>${escapeHtml(message.subject)}</h1>
<div class="card"><dl>
${headerRows}
</dl></div>
${htmlPart}
${textPart}
${files}`,
    apiUrl,
  );
}

export function renderNotFoundPage(apiUrl: string): string {
  return renderPage(
    `Not found · ${INBOX_TITLE}`,
    `<h1>Not found</h1><p>No message here; it may have been cleared.</p><p><a class="back" href="/">← Inbox</a></p>`,
    apiUrl,
  );
}
