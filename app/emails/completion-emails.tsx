import { Button, Link, Section, Text } from "@react-email/components";
import { EmailShell, emailButton, emailText } from "~/emails/email-shell";
import { CARE_NOTES } from "~/lib/builds/care-notes";

export type BalanceLine = { label: string; amount: string };

const heading = { fontSize: "16px", fontWeight: 800, margin: "20px 0 8px" };
const small = { ...emailText, fontSize: "14px", lineHeight: "20px", margin: "0 0 6px" };

/** To the homeowner: the pit is built, here are the photos, the balance and how to look after it. */
export function JobCompletedEmail(props: {
  companyName: string;
  companyPhone?: string;
  customerName: string;
  photoLinks: { href: string; label: string }[];
  photosPage: string;
  balanceLines: BalanceLine[];
  balanceDue: string;
  /** Null when nothing is owed (or a credit is owed back). */
  payLink: string | null;
  creditNote: string | null;
}) {
  return (
    <EmailShell
      companyName={props.companyName}
      companyPhone={props.companyPhone}
      preview={`Your fire pit is built. ${props.payLink ? `Balance due: ${props.balanceDue}.` : ""}`}
    >
      <Text style={emailText}>Hello {props.customerName},</Text>
      <Text style={emailText}>
        Your fire pit is built. Thank you for choosing {props.companyName}. Below are the finished photos, the balance
        and a few notes on looking after the pit.
      </Text>
      <Text style={heading}>Photos of the finished pit</Text>
      {props.photoLinks.length ? (
        <Section>
          {props.photoLinks.map((photo) => (
            <Text key={photo.href} style={small}>
              <Link href={photo.href} style={{ color: "#b14c12", fontWeight: 700 }}>
                {photo.label}
              </Link>
            </Text>
          ))}
        </Section>
      ) : (
        <Text style={small}>The crew&apos;s photos will be on your page shortly.</Text>
      )}
      <Text style={small}>
        Sign in to <Link href={props.photosPage}>your page</Link> to see them all.
      </Text>
      <Text style={heading}>Your balance</Text>
      <Section>
        {props.balanceLines.map((line) => (
          <Text key={line.label} style={small}>
            {line.label}: <strong>{line.amount}</strong>
          </Text>
        ))}
        <Text style={{ ...small, fontSize: "16px", marginTop: "8px" }}>
          Balance due: <strong>{props.balanceDue}</strong>
        </Text>
      </Section>
      {props.creditNote ? <Text style={emailText}>{props.creditNote}</Text> : null}
      {props.payLink ? (
        <Button href={props.payLink} style={emailButton}>
          Pay the balance
        </Button>
      ) : null}
      <Text style={heading}>Looking after your fire pit</Text>
      <Section>
        {CARE_NOTES.map((note) => (
          <Text key={note} style={small}>
            • {note}
          </Text>
        ))}
      </Section>
    </EmailShell>
  );
}

/** To the homeowner (and a copy to the company): the balance is paid and the job is paid in full. */
export function BalancePaidEmail(props: {
  companyName: string;
  companyPhone?: string;
  recipientName: string;
  customerName: string;
  amount: string;
  paidOn: string;
  contract: string;
  forCompany: boolean;
  pageLink: string;
}) {
  return (
    <EmailShell
      companyName={props.companyName}
      companyPhone={props.forCompany ? undefined : props.companyPhone}
      preview={`Receipt: balance of ${props.amount} paid`}
    >
      <Text style={emailText}>Hello {props.recipientName},</Text>
      <Text style={emailText}>
        {props.forCompany
          ? `${props.customerName} paid the balance of ${props.amount} on ${props.paidOn}: the job is paid in full.`
          : `Thank you: we received your payment of ${props.amount} on ${props.paidOn}. Your fire pit is paid in full.`}
      </Text>
      <Text style={emailText}>
        Receipt: balance {props.amount}, paid by card on {props.paidOn}, to {props.companyName}. The whole job came to{" "}
        {props.contract}.
      </Text>
      {props.forCompany ? null : (
        <>
          <Text style={emailText}>
            Keep this e-mail as your receipt. <Link href={props.pageLink}>Your page</Link> keeps the photos and the care
            notes.
          </Text>
        </>
      )}
    </EmailShell>
  );
}
