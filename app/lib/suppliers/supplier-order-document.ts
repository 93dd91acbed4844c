import type { RoundedLine } from "~/domain/supplier-order";

/** A supplier order as it is sent (PDF, CSV and e-mail), in words and figures the yard reads. */
export type SupplierOrderDocument = {
  number: string;
  preparedOn: string;
  company: { name: string; email: string; phone: string; address: string };
  supplier: { name: string; email: string; phone: string };
  drops: {
    job: string;
    requestedOn: string;
    siteAddress: string;
    accessNotes: string;
    lines: RoundedLine[];
    weightLb: number;
  }[];
  weightLb: number;
  unknownWeights: string[];
};
