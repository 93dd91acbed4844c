import { Text } from "@react-email/components";
import { EmailShell, emailText } from "~/emails/email-shell";
import { possessive } from "~/lib/format/wording";

type ConsultEmailProps = {
  companyName: string;
  /** E.164, shown formatted in the footer of the homeowner's copies. */
  companyPhone: string;
  recipientName: string;
  when: string;
  design: string;
  feeText: string;
};

/** Confirmation of a paid consult (the .ics rides along as an attachment). */
export function ConsultConfirmedEmail(props: ConsultEmailProps & { forCompany: boolean; customerName: string }) {
  return (
    <EmailShell
      companyName={props.companyName}
      companyPhone={props.forCompany ? undefined : props.companyPhone}
      preview={`Design consult booked: ${props.when}`}
    >
      {props.forCompany ? null : <Text style={emailText}>Hello {props.recipientName},</Text>}
      <Text style={emailText}>
        {props.forCompany
          ? `${props.customerName} booked and paid for a design consult (${props.feeText}, to be credited toward the build).`
          : `Your design consult with ${props.companyName} is booked and paid (${props.feeText}, credited toward the build).`}
      </Text>
      <Text style={{ ...emailText, fontSize: "18px", fontWeight: 800 }}>{props.when}</Text>
      <Text style={emailText}>Design: {props.design}</Text>
      <Text style={{ ...emailText, fontSize: "13px", color: "#6f655d" }}>
        {props.forCompany
          ? "The calendar file attached puts the visit in the office calendar."
          : "The calendar file attached adds it to your calendar."}
      </Text>
    </EmailShell>
  );
}

export function ConsultReminderEmail(props: ConsultEmailProps) {
  return (
    <EmailShell
      companyName={props.companyName}
      companyPhone={props.companyPhone}
      preview={`Tomorrow: your design consult with ${props.companyName}`}
    >
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
    <EmailShell
      companyName={props.companyName}
      companyPhone={props.companyPhone}
      preview={`Design consult cancelled: ${props.when}`}
    >
      <Text style={emailText}>Hello {props.recipientName},</Text>
      <Text style={emailText}>
        The design consult on {props.when} is cancelled. {props.reason}
      </Text>
      {props.isRefunded ? (
        <Text style={emailText}>
          The fee of {props.feeText} is refunded to the card that paid it; banks take a few days to show it.
        </Text>
      ) : null}
      <Text style={emailText}>Design: {props.design}</Text>
    </EmailShell>
  );
}

/** The office's copy of a cancellation: who cancelled, and what happens to the fee, in the office's words. */
export function ConsultCancelledOfficeEmail(
  props: Omit<ConsultEmailProps, "recipientName"> & { customerName: string; reason: string; isRefunded: boolean },
) {
  return (
    <EmailShell companyName={props.companyName} preview={`Consult cancelled: ${props.customerName}, ${props.when}`}>
      <Text style={emailText}>
        The design consult with {props.customerName} on {props.when} is cancelled. {props.reason}
      </Text>
      {props.isRefunded ? (
        <Text style={emailText}>
          The fee of {props.feeText} is refunded to {possessive(props.customerName)} card automatically; nothing to do.
        </Text>
      ) : null}
      <Text style={emailText}>Design: {props.design}</Text>
      <Text style={{ ...emailText, fontSize: "13px", color: "#6f655d" }}>
        The calendar file attached removes the visit from the office calendar. The time is free for another booking.
      </Text>
    </EmailShell>
  );
}

/** The homeowner's note when their consult moves to another time: the new time, the old one, the fee that stands. */
export function ConsultMovedEmail(props: ConsultEmailProps & { was: string; byCompany: boolean }) {
  return (
    <EmailShell
      companyName={props.companyName}
      companyPhone={props.companyPhone}
      preview={`Design consult moved to ${props.when}`}
    >
      <Text style={emailText}>Hello {props.recipientName},</Text>
      <Text style={emailText}>
        {props.byCompany ? `${props.companyName} moved your design consult` : "Your design consult is moved"} from{" "}
        {props.was} to:
      </Text>
      <Text style={{ ...emailText, fontSize: "18px", fontWeight: 800 }}>{props.when}</Text>
      <Text style={emailText}>
        The fee of {props.feeText} you paid stands for the new time; nothing more is charged.
      </Text>
      <Text style={emailText}>Design: {props.design}</Text>
      <Text style={{ ...emailText, fontSize: "13px", color: "#6f655d" }}>
        The calendar file attached moves the visit in your calendar (it replaces the earlier time).
      </Text>
    </EmailShell>
  );
}

/** The office's note of a moved consult. */
export function ConsultMovedOfficeEmail(
  props: Omit<ConsultEmailProps, "recipientName"> & { customerName: string; was: string; byCustomer: boolean },
) {
  return (
    <EmailShell companyName={props.companyName} preview={`Consult moved: ${props.customerName}, now ${props.when}`}>
      <Text style={emailText}>
        {props.byCustomer
          ? `${props.customerName} moved their design consult online`
          : `The design consult with ${props.customerName} was moved from the workspace`}
        , from {props.was} to:
      </Text>
      <Text style={{ ...emailText, fontSize: "18px", fontWeight: 800 }}>{props.when}</Text>
      <Text style={emailText}>
        The fee of {props.feeText} already paid covers the new time. The earlier time is free for another booking.
      </Text>
      <Text style={emailText}>Design: {props.design}</Text>
      <Text style={{ ...emailText, fontSize: "13px", color: "#6f655d" }}>
        The calendar file attached moves the visit in the office calendar.
      </Text>
    </EmailShell>
  );
}
