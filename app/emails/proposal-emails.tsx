import { Button, Text } from "@react-email/components";
import { EmailShell, emailButton, emailText } from "~/emails/email-shell";

/** To the homeowner: a proposal (or change order) is ready to read and sign. */
export function ProposalSentEmail(props: {
  companyName: string;
  companyPhone?: string;
  customerName: string;
  title: string;
  totalText: string;
  validUntil: string;
  link: string;
  isChangeOrder: boolean;
}) {
  const what = props.isChangeOrder ? "a change order" : "a proposal";
  return (
    <EmailShell
      companyName={props.companyName}
      companyPhone={props.companyPhone}
      preview={`${props.companyName} sent you ${what}: ${props.title}`}
    >
      <Text style={emailText}>Hello {props.customerName},</Text>
      <Text style={emailText}>
        {props.companyName} sent you {what} for {props.title.replace(/^A /, "a ")}: the scope of the work, the price (
        {props.totalText}
        {props.isChangeOrder ? "" : " before any add-ons you choose"}) and the terms. It is open to sign until{" "}
        {props.validUntil}.
      </Text>
      <Button href={props.link} style={emailButton}>
        Read and sign
      </Button>
      <Text style={{ ...emailText, fontSize: "13px", color: "#6f655d", marginTop: "16px" }}>
        This link is yours alone: anyone who has it can read the proposal.
      </Text>
    </EmailShell>
  );
}

/** To both sides: the signed document is attached, with the facts of the signature. */
export function ProposalSignedEmail(props: {
  companyName: string;
  recipientName: string;
  customerName: string;
  title: string;
  number: string;
  totalText: string;
  depositText: string | null;
  signedAt: string;
  sha256: string;
  link: string;
  forCompany: boolean;
}) {
  return (
    <EmailShell companyName={props.companyName} preview={`${props.number} signed by ${props.customerName}`}>
      <Text style={emailText}>Hello {props.recipientName},</Text>
      <Text style={emailText}>
        {props.forCompany ? `${props.customerName} signed ${props.number}` : `You signed ${props.number}`} (
        {props.title}) on {props.signedAt}, for {props.totalText}. The signed PDF is attached: keep it.
      </Text>
      {props.depositText ? (
        <Text style={emailText}>
          {props.forCompany
            ? `The job is signed once the deposit of ${props.depositText} is paid.`
            : `The job is booked once the deposit of ${props.depositText} is paid:`}
        </Text>
      ) : null}
      {props.depositText && !props.forCompany ? (
        <Button href={props.link} style={emailButton}>
          Pay the deposit
        </Button>
      ) : null}
      <Text style={{ ...emailText, fontSize: "12px", color: "#6f655d", marginTop: "16px" }}>
        SHA-256 of the PDF accepted: {props.sha256}
      </Text>
    </EmailShell>
  );
}

/** To both sides: the deposit is in and the job is signed. */
export function DepositPaidEmail(props: {
  companyName: string;
  recipientName: string;
  customerName: string;
  number: string;
  depositText: string;
  balanceText: string;
  forCompany: boolean;
}) {
  return (
    <EmailShell companyName={props.companyName} preview={`Deposit received: ${props.number}`}>
      <Text style={emailText}>Hello {props.recipientName},</Text>
      <Text style={emailText}>
        {props.forCompany
          ? `${props.customerName} paid the deposit of ${props.depositText} on ${props.number}: the job is signed.`
          : `Thank you: your deposit of ${props.depositText} is paid and the job is booked with ${props.companyName}.`}
      </Text>
      <Text style={emailText}>Balance due on completion: {props.balanceText}.</Text>
    </EmailShell>
  );
}
