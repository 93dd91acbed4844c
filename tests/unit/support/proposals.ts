import { randomUUID } from "node:crypto";
import { and, eq } from "drizzle-orm";
import { leads, users, type Lead, type LeadStatus } from "~/db/schema";
import { getCompany } from "~/lib/catalog/catalog.server";
import { db } from "~/lib/platform/db.server";
import { sendProposal, type SendInput } from "~/lib/proposals/proposals.server";
import type { SessionUser } from "~/lib/auth/session.server";
import { demoCompany } from "./demo";

/** A fresh request with a real plan: a copy of a seeded demo request under a new ref. */
export async function copyDemoLead(ref = "demo-cinder-slate-07", status: LeadStatus = "measured"): Promise<Lead> {
  await demoCompany();
  const [template] = await db.select().from(leads).where(eq(leads.ref, ref));
  const { id: _id, ...rest } = template!;
  const [copy] = await db
    .insert(leads)
    .values({
      ...rest,
      ref: `copy-${randomUUID()}`,
      status,
      email: `copy.${randomUUID().slice(0, 8)}@example.test`,
      crewUserId: null,
      stopReason: null,
      pausedStage: null,
    })
    .returning();
  return copy!;
}

export async function officeUser(companyId: number, role: "owner" | "estimator" = "estimator"): Promise<SessionUser> {
  const [person] = await db
    .select()
    .from(users)
    .where(and(eq(users.companyId, companyId), eq(users.role, role)));
  return person as unknown as SessionUser;
}

export const SEND: SendInput = {
  fixedPriceCents: 485_000,
  addOns: [
    { key: "a1", label: "Firebrick lining", cents: 64_000 },
    { key: "a2", label: "A second course of caps", cents: 39_500 },
  ],
  validUntil: "2099-12-31",
  included: "Base\nWall\nCaps",
  excluded: "Permits\nGas lines",
};

/** Sends a proposal for a fresh copy of a demo request; returns the lead (reloaded) and the proposal. */
export async function sentProposal(input: Partial<SendInput> = {}, ref?: string) {
  const lead = await copyDemoLead(ref);
  const company = await getCompany(lead.companyId);
  const user = await officeUser(lead.companyId);
  const proposal = await sendProposal({
    user,
    lead,
    company,
    input: { ...SEND, ...input },
    origin: "http://localhost",
  });
  const [fresh] = await db.select().from(leads).where(eq(leads.id, lead.id));
  return { lead: fresh!, proposal, company, user };
}
