import { Text } from "@react-email/components";
import { EmailShell, emailText } from "~/emails/email-shell";
import { possessive } from "~/lib/format/wording";

type ConsultEmailProps = {
  companyName: string;
  recipientName: string;
  when: string;
  design: string;
  feeText: string;
};

/** Confirmation of a paid consult (the .ics rides along as an attachment). */
export function ConsultConfirmedEmail(props: ConsultEmailProps & { forCompany: boolean; customerName: string }) {
  return (
    <EmailShell companyName={props.companyName} preview={`Design consult booked: ${props.when}`}>
      {props.forCompany ? null : <Text style={emailText}>Hello {props.recipientName},</Text>}
      <Text style={emailText}>
        {props.forCompany
          ? `${props.customerName} booked and paid for a design consult (${props.feeText}, to be credited toward the build).`
          : `Your design consult with ${props.companyName} is booked and paid (${props.feeText}, credited toward the build).`}
      </Text>
      <Text style={{ ...emailText, fontSize: "18px", fontWeight: 800 }}>{props.when}</Text>
      <Text style={emailText}>Design: {props.design}</Text>
      <Text style={{ ...emailText, fontSize: "13px", color: "#6f655d" }}>
        {props.forCompany ? "The calendar file attached puts the visit in the office calendar." : "The calendar file attached adds it to your calendar."}
      </Text>
    </EmailShell>
  );
}

export function ConsultReminderEmail(props: ConsultEmailProps) {
  return (
    <EmailShell companyName={props.companyName} preview={`Tomorrow: your design consult with ${props.companyName}`}>
      <Text style={emailText}>Hello {props.recipientName},</Text>
      <Text style={emailText}>A reminder: your design consult with {props.companyName} is tomorrow.</Text>
      <Text style={{ ...emailText, fontSize: "18px", fontWeight: 800 }}>{props.when}</Text>
      <Text style={emailText}>Design: {props.design}</Text>
      <Text style={emailText}>It helps to have the spot for the fire pit clear enough to walk around and measure.</Text>
    </EmailShell>
  );
}

export function ConsultCancelledEmail(props: ConsultEmailProps & { reason: string; isRefunded: boolean }) {
  return (
    <EmailShell companyName={props.companyName} preview={`Design consult cancelled: ${props.when}`}>
      <Text style={emailText}>Hello {props.recipientName},</Text>
      <Text style={emailText}>The design consult on {props.when} is cancelled. {props.reason}</Text>
      {props.isRefunded ? (
        <Text style={emailText}>The fee of {props.feeText} is refunded to the card that paid it; banks take a few days to show it.</Text>
      ) : null}
      <Text style={emailText}>Design: {props.design}</Text>
    </EmailShell>
  );
}

/** The office's copy of a cancellation: who cancelled, and what happens to the fee, in the office's words. */
export function ConsultCancelledOfficeEmail(props: Omit<ConsultEmailProps, "recipientName"> & { customerName: string; reason: string; isRefunded: boolean }) {
  return (
    <EmailShell companyName={props.companyName} preview={`Consult cancelled: ${props.customerName}, ${props.when}`}>
      <Text style={emailText}>
        The design consult with {props.customerName} on {props.when} is cancelled. {props.reason}
      </Text>
      {props.isRefunded ? (
        <Text style={emailText}>The fee of {props.feeText} is refunded to {possessive(props.customerName)} card automatically; nothing to do.</Text>
      ) : null}
      <Text style={emailText}>Design: {props.design}</Text>
      <Text style={{ ...emailText, fontSize: "13px", color: "#6f655d" }}>The calendar file attached removes the visit from the office calendar. The time is free for another booking.</Text>
    </EmailShell>
  );
}
