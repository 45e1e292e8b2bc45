import { parseWithZod } from "@conform-to/zod/v4";
import { data, redirect } from "react-router";
import type { Route } from "./+types/admin.settings";
import { AgencySettingsForm } from "~/components/agency-settings-form";
import { can } from "~/lib/access";
import { AgencySettingsSchema } from "~/lib/agency-settings-form";
import { requireCapability } from "~/lib/access.server";
import { readFormData } from "~/lib/form-data.server";
import { clientAddress } from "~/lib/http.server";
import { conflict, refusalData } from "~/lib/refusal";
import { flashHeaders } from "~/lib/session.server";
import { saveAgencySettings } from "~/models/agency.server";
import { readAgencySettings } from "~/models/agency-settings.server";

export const meta: Route.MetaFunction = () => [{ title: "Agency settings · Foamtally" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireCapability(request, "settings.read");
  const settings = await readAgencySettings();
  return { settings, timeZones: Intl.supportedValuesOf("timeZone"), canEdit: can(user, "settings.edit") };
}

export async function action({ request }: Route.ActionArgs) {
  const user = await requireCapability(request, "settings.edit");
  const submission = parseWithZod(await readFormData(request, AgencySettingsSchema), {
    schema: AgencySettingsSchema,
  });
  if (submission.status !== "success") {
    return data({ result: submission.reply(), conflict: null }, { status: 400 });
  }
  const outcome = await saveAgencySettings(submission.value, user, clientAddress(request));
  if (!outcome.ok) {
    return refusalData(
      submission,
      conflict(
        "Someone else saved the agency settings after you opened this page. Nothing of yours was saved: compare the stored values below with yours, then save again.",
      ),
      { conflict: outcome.conflict },
    );
  }
  const message =
    outcome.changed.length === 0
      ? "Nothing had changed; the settings stay as they were."
      : `Agency settings saved.${outcome.eventsRechecked === null ? "" : ` The new waterway buffer rechecked ${outcome.eventsRechecked} events.`}`;
  throw redirect("/admin/settings", { headers: await flashHeaders(request, message) });
}

export default function AgencySettingsPage({ loaderData, actionData }: Route.ComponentProps) {
  return (
    <div className="space-y-6">
      <h1 className="text-2xl font-bold">Agency settings</h1>
      <p className="max-w-3xl">
        The agency&apos;s name and time zone, the buffers and thresholds every report is checked against, who receives
        the quarterly workbook and release alerts, and how public-records requests are counted.
      </p>
      <AgencySettingsForm
        settings={loaderData.settings}
        timeZones={loaderData.timeZones}
        readOnly={!loaderData.canEdit}
        lastResult={actionData?.result}
        conflict={actionData?.conflict ?? undefined}
      />
    </div>
  );
}
