import type { Company } from "~/db/schema";
import { createLead } from "~/lib/leads.server";

let n = 0;

/** A minimal saved request for a company (no photos), as the configurator would save it. */
export async function createTestLead(company: Company, email = `lead${Date.now()}-${++n}@example.test`) {
  return createLead({
    company,
    form: { customerName: "Wren Castellano", email, phone: "555 010 1234", street: "3 Hollow Oak Way", town: "Millbrook Falls", buildWindow: "this-season", notes: "", consent: "on" },
    photos: [],
    origin: "http://localhost",
    snapshot: { design: { summary: [{ label: "Bowl", value: "36 9/16 in across inside" }] }, plan: {}, stoneName: "Hearthline Taper", bowlDiameterIn: 36.575, priceLowCents: 200000, priceHighCents: 250000, summary: [] },
  });
}
