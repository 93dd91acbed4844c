import { Text } from "@react-email/components";
import { EmailShell, emailText } from "~/emails/email-shell";
import { describeOrderQuantity, formatDeliveryDay, formatPounds } from "~/lib/suppliers/order-units";
import type { SupplierOrderDocument } from "~/lib/suppliers/supplier-order-document";

/** To the supplier: the order in words, with the PDF and CSV attached. */
export function SupplierOrderEmail({ document }: { document: SupplierOrderDocument }) {
  const c = document.company;
  return (
    <EmailShell companyName={c.name} preview={`Order ${document.number} from ${c.name}`}>
      <Text style={emailText}>Hello {document.supplier.name},</Text>
      <Text style={emailText}>
        {c.name} would like to order the following; the order is attached as a PDF and as a CSV. Please confirm by
        replying to {c.email}
        {c.phone ? ` or calling ${c.phone}` : ""}.
      </Text>
      {document.drops.map((drop) => (
        <Text key={`${drop.job}-${drop.requestedOn}`} style={emailText}>
          <strong>
            Deliver {formatDeliveryDay(drop.requestedOn)} to {drop.siteAddress}
          </strong>{" "}
          ({drop.job})
          <br />
          {drop.lines.map((l) => `${describeOrderQuantity(l.orderQuantity, l.orderUnit)} ${l.item}`).join("; ")}. About{" "}
          {formatPounds(drop.weightLb)}.
          {drop.accessNotes ? (
            <>
              <br />
              Access: {drop.accessNotes}
            </>
          ) : null}
        </Text>
      ))}
    </EmailShell>
  );
}
