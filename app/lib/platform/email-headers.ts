/*
 * Who an e-mail says it is from. Every message goes out from the product's own sending address
 * (EMAIL_FROM, the domain that is verified with the mail service), but a message about a company's
 * work carries that company's name as the sender's display name and its address as Reply-To, so
 * the homeowner sees who wrote and reaches the contractor by replying. Pure: no env, no I/O.
 */

// RFC 5322 3.2.3: the characters an atom may hold without quoting ("atext").
const ATEXT = /^[A-Za-z0-9!#$%&'*+\-/=?^_`{|}~]+$/;

/** The bare address of `addr` or `Name <addr>` (the sending setting may be either). */
export function mailboxAddress(value: string): string {
  const named = /<([^<>]+)>\s*$/.exec(value);
  return (named ? named[1]! : value).trim();
}

/**
 * A display name as an RFC 5322 phrase (3.2.5): words of atext stay as they are, anything else
 * becomes one quoted-string (3.2.4) with `\` and `"` escaped. Line breaks and other control
 * characters are removed (a header never gets a line break from data), and so are angle brackets,
 * which the mail service's address parser refuses inside names. Non-ASCII letters are kept: the
 * service encodes them for the wire (RFC 2047).
 */
export function displayName(name: string): string {
  const clean = name
    .replace(/[\u0000-\u001f\u007f<>]/g, " ")
    .replace(/\s+/g, " ")
    .trim()
    .slice(0, 120);
  if (clean === "") return "";
  if (clean.split(" ").every((word) => ATEXT.test(word))) return clean;
  return `"${clean.replace(/(["\\])/g, "\\$1")}"`;
}

/**
 * From and Reply-To for one outgoing message. With a company: its name on the product's sending
 * address, and Reply-To its own address, unless the message goes to that address (the office's own
 * copy needs no reply-to itself). Without one (nothing here yet), the sending setting as it is.
 */
export function senderHeaders(args: {
  sendingFrom: string;
  company: { name: string; email: string } | null;
  to: string;
}): { from: string; replyTo?: string } {
  if (!args.company) return { from: args.sendingFrom };
  const address = mailboxAddress(args.sendingFrom);
  const name = displayName(args.company.name);
  const from = name ? `${name} <${address}>` : address;
  const isToCompany = mailboxAddress(args.to).toLowerCase() === args.company.email.trim().toLowerCase();
  return isToCompany || !args.company.email ? { from } : { from, replyTo: args.company.email.trim() };
}
