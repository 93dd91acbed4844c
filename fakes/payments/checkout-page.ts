import type { CardFieldErrors, CardForm } from "./ledger";
import { formatAmount } from "./ledger";
import type { SessionRecord } from "./state";

/** Escapes text for HTML element content and quoted attribute values. */
export function escapeHtml(value: string): string {
  return value
    .replace(/&/g, "&amp;")
    .replace(/</g, "&lt;")
    .replace(/>/g, "&gt;")
    .replace(/"/g, "&quot;")
    .replace(/'/g, "&#39;");
}

// A plain page of its own: a test stand-in, and it says so on every screen. Monospace ticket look, no logo.
const STYLE = `
*{box-sizing:border-box}
body{margin:0;font:16px/1.5 ui-monospace,"DejaVu Sans Mono",Menlo,Consolas,monospace;background:#e9ecef;color:#1d2329}
.standin{margin:0;padding:.5rem 1rem;background:#1d2329;color:#f8f9fa;font-size:.85rem;text-align:center;letter-spacing:.02em}
main{max-width:32rem;margin:1.5rem auto;padding:0 1rem}
.sheet{background:#fff;border:2px dashed #6c7781;padding:1.25rem}
h1{font-size:1.2rem;margin:0 0 .25rem;text-transform:uppercase;letter-spacing:.04em}
h2{font-size:.95rem;margin:1.25rem 0 .5rem;text-transform:uppercase;letter-spacing:.04em}
.payee{margin:0;color:#4a545e}
.items{list-style:none;margin:0;padding:0;border-top:1px dashed #adb5bd}
.items li{display:flex;justify-content:space-between;gap:1rem;padding:.5rem 0;border-bottom:1px dashed #adb5bd}
.items small{display:block;color:#4a545e}
.total{display:flex;justify-content:space-between;font-weight:700;margin:.75rem 0 0}
label{display:block;font-weight:700;margin:.9rem 0 .25rem}
input{width:100%;font:inherit;padding:.5rem .6rem;border:2px solid #4a545e;border-radius:0;background:#fff}
input:focus{outline:3px solid #0b5cad;outline-offset:1px}
input[aria-invalid=true]{border-color:#a61b1b}
.row{display:flex;gap:.75rem;align-items:flex-start}
.row>div{flex:1}
.field-error{color:#a61b1b;margin:.2rem 0 0;font-size:.9rem}
.alert{border:2px solid #a61b1b;background:#fdecec;color:#7a1010;padding:.6rem .8rem;margin:1rem 0 0}
.note{border-left:4px solid #6c7781;background:#f1f3f5;padding:.5rem .8rem;font-size:.85rem;color:#343a40;margin:1rem 0 0}
.submit-message{margin:1rem 0 0;font-size:.9rem;color:#343a40}
button{margin-top:1rem;width:100%;font:inherit;font-weight:700;padding:.7rem;border:2px solid #1d2329;border-radius:0;background:#1d2329;color:#fff;cursor:pointer;text-transform:uppercase;letter-spacing:.04em}
button:hover{background:#343a40}
button:focus-visible{outline:3px solid #0b5cad;outline-offset:2px}
.back{display:inline-block;margin-top:1rem;color:#0b5cad}
`;

function layout(title: string, body: string): string {
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(title)}</title>
<style>${STYLE}</style>
</head>
<body>
<p class="standin">Local payments stand-in for development and tests: no real card is charged</p>
<main>
<div class="sheet">
${body}
</div>
</main>
</body>
</html>`;
}

function summary(record: SessionRecord): string {
  const { session } = record;
  const items = record.lineItems
    .map((item) => {
      const line = formatAmount(item.unitAmount * item.quantity, item.currency);
      const qty = item.quantity > 1 ? ` × ${item.quantity}` : "";
      const detail = item.description ? `<small>${escapeHtml(item.description)}</small>` : "";
      return `<li><span>${escapeHtml(item.name)}${qty}${detail}</span><span>${escapeHtml(line)}</span></li>`;
    })
    .join("\n");
  const total = formatAmount(session.amount_total, session.currency);
  return `<section aria-labelledby="order-heading">
<h2 id="order-heading">What you are paying for</h2>
<ul class="items">
${items}
</ul>
<p class="total"><span>Total due</span><span>${escapeHtml(total)}</span></p>
</section>`;
}

interface FieldSpec {
  key: keyof CardForm;
  id: string;
  label: string;
  autocomplete: string;
  inputmode: string;
  placeholder: string;
}

const FIELDS: Record<keyof CardForm, FieldSpec> = {
  number: {
    key: "number",
    id: "card-number",
    label: "Card number",
    autocomplete: "cc-number",
    inputmode: "numeric",
    placeholder: "4242 4242 4242 4242",
  },
  expiry: {
    key: "expiry",
    id: "card-expiry",
    label: "Expiry (MM / YY)",
    autocomplete: "cc-exp",
    inputmode: "numeric",
    placeholder: "MM / YY",
  },
  cvc: {
    key: "cvc",
    id: "card-cvc",
    label: "Security code (CVC)",
    autocomplete: "cc-csc",
    inputmode: "numeric",
    placeholder: "123",
  },
  name: {
    key: "name",
    id: "card-name",
    label: "Name on card",
    autocomplete: "cc-name",
    inputmode: "text",
    placeholder: "",
  },
};

// Form field names posted by the page; the server reads the same names back.
export const CARD_FIELD_NAMES: Record<keyof CardForm, string> = {
  number: "card_number",
  expiry: "card_expiry",
  cvc: "card_cvc",
  name: "cardholder_name",
};

function field(spec: FieldSpec, form: CardForm, errors: CardFieldErrors): string {
  const error = errors[spec.key];
  const errorId = `${spec.id}-error`;
  const describedBy = error ? ` aria-describedby="${errorId}" aria-invalid="true"` : "";
  const placeholder = spec.placeholder ? ` placeholder="${escapeHtml(spec.placeholder)}"` : "";
  return `<div>
<label for="${spec.id}">${escapeHtml(spec.label)}</label>
<input id="${spec.id}" name="${CARD_FIELD_NAMES[spec.key]}" autocomplete="${spec.autocomplete}" inputmode="${spec.inputmode}" value="${escapeHtml(form[spec.key])}"${placeholder}${describedBy} required>
${error ? `<p class="field-error" id="${errorId}">${escapeHtml(error)}</p>` : ""}
</div>`;
}

export interface CheckoutPageInput {
  record: SessionRecord;
  form?: CardForm;
  errors?: CardFieldErrors;
  // A message about the payment as a whole, such as a decline.
  alert?: string;
}

/** The card form for an open session, with any errors from the last try shown beside their fields. */
export function renderCheckoutPage({ record, form, errors = {}, alert }: CheckoutPageInput): string {
  const { session } = record;
  const values: CardForm = form ?? { number: "", expiry: "", cvc: "", name: "" };
  const total = formatAmount(session.amount_total, session.currency);
  const fieldErrorCount = Object.keys(errors).length;
  const alertText = alert ?? (fieldErrorCount > 0 ? "Check the card details below." : undefined);
  const payer = session.customer_email ? `<p class="payee">Receipt to ${escapeHtml(session.customer_email)}</p>` : "";
  const cancel = session.cancel_url
    ? `<a class="back" href="${escapeHtml(session.cancel_url)}">Cancel and go back</a>`
    : "";
  // Who is paid is whatever the line items and the submit note say (the business names itself there).
  const submitNote = record.submitMessage ? `<p class="submit-message">${escapeHtml(record.submitMessage)}</p>` : "";
  const body = `<h1>Test checkout: ${escapeHtml(total)}</h1>
${payer}
${summary(record)}
<h2 id="card-heading">Card details</h2>
${alertText ? `<div class="alert" role="alert">${escapeHtml(alertText)}</div>` : ""}
<form method="post" action="/pay/${escapeHtml(encodeURIComponent(session.id))}" aria-labelledby="card-heading" novalidate>
${field(FIELDS.number, values, errors)}
<div class="row">
${field(FIELDS.expiry, values, errors)}
${field(FIELDS.cvc, values, errors)}
</div>
${field(FIELDS.name, values, errors)}
${submitNote}
<button type="submit">Pay ${escapeHtml(total)}</button>
</form>
<p class="note">Test cards: 4242 4242 4242 4242 pays; 4000 0000 0000 0002 is declined. Use any future expiry date and any three digits.</p>
${cancel}`;
  return layout(`Pay ${total} (test checkout)`, body);
}

/** What a customer sees when the session can no longer take a payment. */
export function renderClosedPage(record: SessionRecord, successRedirect: string): string {
  const { session } = record;
  if (session.status === "complete") {
    return layout(
      "Already paid (test checkout)",
      `<h1>This checkout is already paid</h1>
<p>The payment of ${escapeHtml(formatAmount(session.amount_total, session.currency))} went through. Nothing more to do here.</p>
<a class="back" href="${escapeHtml(successRedirect)}">Continue</a>`,
    );
  }
  const back = session.cancel_url ? `<a class="back" href="${escapeHtml(session.cancel_url)}">Go back</a>` : "";
  return layout(
    "Checkout expired (test checkout)",
    `<h1>This checkout has expired</h1>
<p>No payment was taken. Go back and start the booking again to get a new checkout.</p>
${back}`,
  );
}

export function renderNotFoundPage(): string {
  return layout(
    "Checkout not found (test checkout)",
    `<h1>This checkout link is not valid</h1>
<p>Check the link, or go back and start the booking again.</p>`,
  );
}
