import { data, Form, redirect, useLocation, useNavigation, useSearchParams } from "react-router";
import type { Route } from "./+types/app-team";
import { WorkspaceProblem } from "~/components/workspace-problem";
import { fieldErrors } from "~/lib/format/form-fields";
import { ROLE_LABEL } from "~/components/workspace-shell";
import { FormAlert, SelectField, TextField } from "~/components/ui/field";
import { STAFF_ROLES } from "~/db/enums";
import { getCompany } from "~/lib/catalog/catalog.server";
import { appOrigin } from "~/lib/platform/email.server";
import { requireUser } from "~/lib/auth/session.server";
import { teamActionSchema } from "~/lib/auth/team-schema";
import { changeRole, inviteStaff, listTeam, setActive, type TeamResult } from "~/lib/auth/team.server";
import { readTextFields } from "~/lib/platform/forms.server";

export const meta: Route.MetaFunction = () => [{ title: "Team · Emberwright" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request, { roles: ["owner"] });
  return { team: await listTeam(user.companyId), myId: user.id };
}

const SAVED: Record<string, string> = {
  invite: "Invitation sent. It works once, for 7 days.",
  role: "Role changed. It applies from their next page.",
  deactivate: "Deactivated and signed out everywhere.",
  reactivate: "Reactivated: they can sign in again.",
};

export async function action({ request }: Route.ActionArgs) {
  const user = await requireUser(request, { roles: ["owner"] });
  const fields = await readTextFields(request);
  const parsed = teamActionSchema.safeParse(fields);
  const userId = fields.userId ?? null;
  if (!parsed.success) {
    return data(
      { intent: fields.intent ?? null, userId, errors: fieldErrors(parsed.error), values: fields },
      { status: 400 },
    );
  }
  const input = parsed.data;
  let result: TeamResult;
  if (input.intent === "invite") {
    const company = await getCompany(user.companyId);
    result = await inviteStaff({
      owner: user,
      company,
      name: input.name,
      email: input.email,
      role: input.role,
      origin: appOrigin(request),
    });
  } else if (input.intent === "role") {
    result = await changeRole(user, input.userId, input.role);
  } else {
    result = await setActive(user, input.userId, input.intent === "reactivate");
  }
  if (!result.ok)
    return data(
      { intent: input.intent as string | null, userId, errors: result.errors, values: fields },
      { status: result.status },
    );
  return redirect(`/app/team?saved=${input.intent}`);
}

export default function TeamRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { team, myId } = loaderData;
  const [params] = useSearchParams();
  const location = useLocation();
  const navigation = useNavigation();
  const isBusy = navigation.state === "submitting";
  const saved = !actionData ? SAVED[params.get("saved") ?? ""] : undefined;
  const inviteErrors: Record<string, string> = actionData?.intent === "invite" ? actionData.errors : {};
  const rowErrors = (id: number): Record<string, string> =>
    actionData && actionData.userId === String(id) ? actionData.errors : {};
  const generalErrors = actionData && !actionData.intent ? actionData.errors : {};

  return (
    <div className="mx-auto flex max-w-5xl flex-col gap-6">
      <div>
        <h1 className="text-2xl font-extrabold">Team</h1>
        <p className="text-char-600">Who can sign in to your workspace, and what each person sees.</p>
      </div>
      {saved ? (
        <p role="status" className="rounded-lg bg-moss-100 px-4 py-3 text-sm font-semibold text-moss-700">
          {saved}
        </p>
      ) : null}
      {Object.keys(generalErrors).length ? <FormAlert>{Object.values(generalErrors).join(" ")}</FormAlert> : null}

      <section aria-labelledby="staff-title" className="overflow-hidden card">
        <h2
          id="staff-title"
          className="border-b border-ash-200 bg-ash-100 px-4 py-2 text-sm font-extrabold tracking-wide text-char-700 uppercase"
        >
          Staff
        </h2>
        <ul className="divide-y divide-ash-200">
          {team.map((member) => {
            const isMe = member.id === myId;
            const errors = rowErrors(member.id);
            return (
              <li
                key={member.id}
                className={`flex flex-col gap-3 px-4 py-3 md:flex-row md:items-center md:justify-between ${member.isActive ? "" : "bg-ash-50 text-char-500"}`}
              >
                <div className="min-w-0">
                  <p className="font-bold text-char-900">
                    {member.name} {isMe ? <span className="text-sm font-semibold text-char-500">(you)</span> : null}
                  </p>
                  <p className="text-sm break-all">{member.email}</p>
                  <p className="text-xs font-bold">
                    {!member.isActive ? (
                      <span className="text-alert-700">Deactivated</span>
                    ) : member.hasPassword ? (
                      <span className="text-moss-700">Active</span>
                    ) : (
                      <span className="text-ember-700">Invited, has not set a password yet</span>
                    )}
                  </p>
                  {Object.keys(errors).length ? (
                    <FormAlert className="mt-1">Not changed. {Object.values(errors).join(" ")}</FormAlert>
                  ) : null}
                </div>
                {isMe ? (
                  <p className="text-sm text-char-600">
                    {ROLE_LABEL[member.role]}: you cannot change your own role or deactivate yourself.
                  </p>
                ) : (
                  <div className="flex flex-wrap items-end gap-2">
                    <Form method="post" className="flex items-end gap-2">
                      <input type="hidden" name="intent" value="role" />
                      <input type="hidden" name="userId" value={member.id} />
                      <label className="sr-only" htmlFor={`role-${member.id}`}>
                        Role of {member.name}
                      </label>
                      <select
                        id={`role-${member.id}`}
                        name="role"
                        defaultValue={member.role}
                        className="field-input mt-0 w-36"
                        disabled={!member.isActive}
                      >
                        {STAFF_ROLES.map((r) => (
                          <option key={r} value={r}>
                            {ROLE_LABEL[r]}
                          </option>
                        ))}
                      </select>
                      <button
                        type="submit"
                        className="btn-quiet"
                        disabled={isBusy || !member.isActive}
                        aria-label={`Change role of ${member.name}`}
                      >
                        Change role
                      </button>
                    </Form>
                    <Form method="post">
                      <input type="hidden" name="intent" value={member.isActive ? "deactivate" : "reactivate"} />
                      <input type="hidden" name="userId" value={member.id} />
                      <button
                        type="submit"
                        className={
                          member.isActive
                            ? "btn border border-alert-600/40 bg-white text-alert-700 hover:bg-alert-100"
                            : "btn-quiet"
                        }
                        disabled={isBusy}
                      >
                        {member.isActive ? `Deactivate ${member.name}` : `Reactivate ${member.name}`}
                      </button>
                    </Form>
                  </div>
                )}
              </li>
            );
          })}
        </ul>
      </section>

      <section aria-labelledby="invite-title" className="card p-5">
        <h2 id="invite-title" className="text-lg font-extrabold">
          Invite someone
        </h2>
        <p className="text-sm text-char-600">
          They get an e-mail with a link to set a password. Estimators work the inbox; crew see only the jobs you give
          them.
        </p>
        {/* A new location after a successful invitation remounts the form, emptying it for the next one. */}
        <Form
          key={location.key}
          method="post"
          className="mt-4 grid gap-4 sm:grid-cols-[1fr_1fr_12rem_auto] sm:items-start"
          noValidate
        >
          <input type="hidden" name="intent" value="invite" />
          {Object.keys(inviteErrors).length ? (
            <FormAlert className="sm:col-span-4">Nobody was invited. Fix the fields marked below.</FormAlert>
          ) : null}
          <TextField
            label="Name"
            name="name"
            defaultValue={actionData?.intent === "invite" ? actionData.values.name : ""}
            error={inviteErrors.name}
            maxLength={80}
            autoComplete="off"
          />
          <TextField
            label="E-mail"
            name="email"
            type="email"
            defaultValue={actionData?.intent === "invite" ? actionData.values.email : ""}
            error={inviteErrors.email}
            autoComplete="off"
          />
          <SelectField
            label="Role"
            name="role"
            defaultValue={actionData?.intent === "invite" ? actionData.values.role : "estimator"}
            error={inviteErrors.role}
          >
            {STAFF_ROLES.map((r) => (
              <option key={r} value={r}>
                {ROLE_LABEL[r]}
              </option>
            ))}
          </SelectField>
          <button type="submit" className="btn-primary sm:mt-6" disabled={isBusy}>
            Send invitation
          </button>
        </Form>
      </section>
    </div>
  );
}

/** A missing or forbidden record shows its problem inside the workspace, navigation kept. */
export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <WorkspaceProblem error={error} />;
}
