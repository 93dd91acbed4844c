import { parsePhoneNumberFromString } from "libphonenumber-js/min";

/*
 * Phone numbers are stored in E.164 ("+12175550142", ITU-T E.164) and shown formatted for people.
 * Parsing and formatting are libphonenumber-js (a port of Google's libphonenumber). Numbers typed
 * without a country code are read as North American, where the product's contractors work.
 */
export const DEFAULT_PHONE_REGION = "US" as const;

/**
 * "(217) 555-0142" for a North American number, "+44 20 7946 0958" for others; text that is not a number is shown as
 * stored.
 */
export function formatPhone(stored: string): string {
  const parsed = parsePhoneNumberFromString(stored, DEFAULT_PHONE_REGION);
  if (!parsed) return stored;
  return parsed.country === DEFAULT_PHONE_REGION ? parsed.formatNational() : parsed.formatInternational();
}

/** The href of a tel: link (RFC 3966) for a stored number. */
export function phoneHref(stored: string): string {
  const parsed = parsePhoneNumberFromString(stored, DEFAULT_PHONE_REGION);
  return parsed ? parsed.getURI() : `tel:${stored.replace(/[^\d+]/g, "")}`;
}

/** A stored number as a page shows it: formatted text and its tel: link; null for none. */
export type PhoneDisplay = { text: string; href: string } | null;

/**
 * Formats on the server so the browser never downloads the numbering plans (about 30 kB gzipped):
 * loaders send this, components print it.
 */
export function phoneDisplay(stored: string | null | undefined): PhoneDisplay {
  return stored ? { text: formatPhone(stored), href: phoneHref(stored) } : null;
}
