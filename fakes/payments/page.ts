/** The hosted card page at /pay/<session id>: shows the session, takes a test card, redirects on success. */
import type { IncomingMessage, ServerResponse } from "node:http";
import { readBody, sendHtml } from "../shared/http";
import { MAX_BODY_BYTES } from "./api";
import { CARD_FIELD_NAMES, renderCheckoutPage, renderClosedPage, renderNotFoundPage } from "./checkout-page";
import { parseFormBody, type FormObject } from "./form-encoding";
import { TEST_CARD_MESSAGE, type CardForm, type PaymentsLedger } from "./ledger";

const PAGE_HEADERS = {
  "Content-Type": "text/html; charset=utf-8",
  "Cache-Control": "no-store",
  // No scripts at all; styles are inline; the page may not be framed.
  "Content-Security-Policy": "default-src 'none'; style-src 'unsafe-inline'; base-uri 'none'; frame-ancestors 'none'",
  "X-Content-Type-Options": "nosniff",
  "Referrer-Policy": "no-referrer",
};

function sendPage(res: ServerResponse, status: number, html: string): void {
  sendHtml(res, status, html, PAGE_HEADERS);
}

function readCardForm(fields: FormObject): CardForm {
  const text = (key: string) => {
    const value = fields[key];
    return typeof value === "string" ? value : "";
  };
  return {
    number: text(CARD_FIELD_NAMES.number),
    expiry: text(CARD_FIELD_NAMES.expiry),
    cvc: text(CARD_FIELD_NAMES.cvc),
    name: text(CARD_FIELD_NAMES.name),
  };
}

function sessionIdOf(url: URL): string {
  const match = /^\/pay\/([^/]+)$/.exec(url.pathname);
  try {
    return match ? decodeURIComponent(match[1]) : "";
  } catch {
    return "";
  }
}

/** Answers one /pay/… request. */
export async function handlePage(
  ledger: PaymentsLedger,
  req: IncomingMessage,
  res: ServerResponse,
  url: URL,
): Promise<void> {
  const id = sessionIdOf(url);
  const record = id ? ledger.getSession(id) : undefined;
  if (!record) return sendPage(res, 404, renderNotFoundPage());

  if (req.method === "GET" || req.method === "HEAD") {
    ledger.expireIfDue(record);
    if (record.session.status !== "open")
      return sendPage(res, 200, renderClosedPage(record, ledger.successRedirect(record)));
    return sendPage(res, 200, renderCheckoutPage({ record }));
  }
  if (req.method !== "POST") {
    res.writeHead(405, { Allow: "GET, POST" });
    res.end();
    return;
  }

  let form: CardForm;
  try {
    form = readCardForm(parseFormBody(await readBody(req, MAX_BODY_BYTES)));
  } catch {
    return sendPage(res, 400, renderCheckoutPage({ record, alert: "The form could not be read. Try again." }));
  }
  const result = ledger.paySession(id, form, "page");
  switch (result.kind) {
    case "paid":
      res.writeHead(303, { Location: ledger.successRedirect(result.record), "Cache-Control": "no-store" });
      res.end();
      return;
    case "declined":
      return sendPage(res, 402, renderCheckoutPage({ record, form, alert: `${result.message} Try another card.` }));
    case "invalid": {
      const alert =
        result.errors.number === TEST_CARD_MESSAGE && Object.keys(result.errors).length === 1
          ? TEST_CARD_MESSAGE
          : undefined;
      return sendPage(res, 400, renderCheckoutPage({ record, form, errors: result.errors, alert }));
    }
    case "not_open":
      return sendPage(res, 409, renderClosedPage(result.record, ledger.successRedirect(result.record)));
    case "not_found":
      return sendPage(res, 404, renderNotFoundPage());
  }
}
