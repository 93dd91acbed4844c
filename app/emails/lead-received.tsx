import { Button, Text } from "@react-email/components";
import { DesignSummary, type DesignSummaryLine } from "~/emails/design-summary";
import { EmailShell, emailButton, emailText } from "~/emails/email-shell";

/** To the homeowner: we have your request, here is the design, and a link to follow it. */
export function LeadReceivedEmail(props: {
  companyName: string;
  /** E.164; the footer shows it formatted. */
  companyPhone?: string;
  customerName: string;
  summary: DesignSummaryLine[];
  /** Sets a password and adds this request to the new account. */
  accountLink: string | null;
  /** For an address that already has an account: adds this request to it. */
  confirmLink?: string | null;
  requestLink: string;
}) {
  return (
    <EmailShell
      companyName={props.companyName}
      companyPhone={props.companyPhone}
      preview={`${props.companyName} has your fire-pit request`}
    >
      <Text style={emailText}>Hello {props.customerName},</Text>
      <Text style={emailText}>
        Thank you for your fire-pit request. {props.companyName} will look at your design and your yard photos and get
        in touch, usually within two working days.
      </Text>
      <DesignSummary lines={props.summary} />
      {props.accountLink ? (
        <>
          <Text style={emailText}>Set a password to follow your request and book a design consult:</Text>
          <Button href={props.accountLink} style={emailButton}>
            Set my password
          </Button>
          <Text style={{ ...emailText, fontSize: "13px", color: "#6f655d", marginTop: "12px" }}>
            This link works once, for 7 days.
          </Text>
        </>
      ) : props.confirmLink ? (
        <>
          <Text style={emailText}>
            This address already has an account. If you sent this request, add it to your requests, then sign in to
            follow it and book a design consult:
          </Text>
          <Button href={props.confirmLink} style={emailButton}>
            Add it to my requests
          </Button>
          <Text style={{ ...emailText, fontSize: "13px", color: "#6f655d", marginTop: "12px" }}>
            If you did not send it, ignore this e-mail: the request stays out of your account.
          </Text>
        </>
      ) : (
        <Button href={props.requestLink} style={emailButton}>
          See my request
        </Button>
      )}
    </EmailShell>
  );
}
