import { Button, Text } from "@react-email/components";
import { DesignSummary, type DesignSummaryLine } from "~/emails/design-summary";
import { EmailShell, emailButton, emailText } from "~/emails/email-shell";

/** To the contractor: a new request is waiting in the inbox. */
export function NewLeadEmail(props: {
  companyName: string;
  customerName: string;
  town: string;
  photoCount: number;
  summary: DesignSummaryLine[];
  leadLink: string;
}) {
  return (
    <EmailShell companyName={props.companyName} preview={`New request from ${props.customerName} in ${props.town}`}>
      <Text style={emailText}>
        <strong>{props.customerName}</strong> in {props.town} sent a fire-pit request with {props.photoCount}{" "}
        {props.photoCount === 1 ? "yard photo" : "yard photos"}.
      </Text>
      <DesignSummary lines={props.summary} />
      <Button href={props.leadLink} style={emailButton}>
        Open the request
      </Button>
    </EmailShell>
  );
}
