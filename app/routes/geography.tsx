import { data, Form, redirect, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/geography";
import { EarlierFiles } from "~/components/earlier-files";
import { EventLocationMap } from "~/components/event-location-map";
import { requireCapability } from "~/lib/access.server";
import { BodyRefused, formShape, readBoundedForm } from "~/lib/form-data.server";
import { isLayerKind, LAYER_KINDS, LAYER_RULES, MAX_LAYER_BYTES } from "~/lib/geo/layers";
import { clientAddress } from "~/lib/http.server";
import { UPLOAD_BODY_MAX_BYTES } from "~/lib/request-limits";
import { flashHeaders } from "~/lib/session.server";
import { StorageUnavailableError } from "~/lib/storage.server";
import { earlierVersions, type FileVersion } from "~/models/file-versions.server";
import { listLayers, replaceLayer, waterwayBufferMetres } from "~/models/geography.server";

export const meta: Route.MetaFunction = () => [{ title: "Drainage and waterway layers · Foamtally" }];

export async function loader({ request }: Route.LoaderArgs) {
  await requireCapability(request, "geography.edit");
  const [layers, waterwayBufferM, earlier] = await Promise.all([
    listLayers(),
    waterwayBufferMetres(),
    Promise.all(LAYER_KINDS.map(async (kind) => [kind, await earlierVersions("geo_layer", kind)] as const)),
  ]);
  return { layers, waterwayBufferM, earlier: Object.fromEntries(earlier) as Record<string, FileVersion[]> };
}

const LAYER_UPLOAD_SHAPE = formShape(z.object({ kind: z.string().max(40), file: z.file() }));

type ActionResult = { kind: string; errors: string[] };

export async function action({ request }: Route.ActionArgs) {
  const user = await requireCapability(request, "geography.edit");
  const refuse = (kind: string, errors: string[], status = 400) => data<ActionResult>({ kind, errors }, { status });
  const declared = Number(request.headers.get("Content-Length") ?? 0);
  if (declared > MAX_LAYER_BYTES + 64 * 1024) {
    return refuse("", [`The file is larger than ${MAX_LAYER_BYTES / 1024 / 1024} MB. Nothing was changed.`], 413);
  }
  let formData: FormData;
  try {
    formData = await readBoundedForm(request, LAYER_UPLOAD_SHAPE, UPLOAD_BODY_MAX_BYTES);
  } catch (error) {
    if (!(error instanceof BodyRefused)) throw error;
    return refuse("", [error.message, "Nothing was changed."], error.status);
  }
  const kind = String(formData.get("kind") ?? "");
  if (!isLayerKind(kind)) return refuse(kind, ["Choose which layer the file is for."]);
  const file = formData.get("file");
  if (!(file instanceof File) || file.size === 0) {
    return refuse(kind, ["Choose a GeoJSON file (.geojson or .json) to upload."]);
  }
  if (file.size > MAX_LAYER_BYTES) {
    return refuse(kind, [`The file is larger than ${MAX_LAYER_BYTES / 1024 / 1024} MB. Nothing was changed.`], 413);
  }
  // A database outage rolls the whole replacement back; the page then says so plainly.
  const result = await replaceLayer(
    { kind, text: await file.text(), fileName: file.name || "upload.geojson" },
    user,
    clientAddress(request),
  ).catch((error) => {
    if (error instanceof StorageUnavailableError) return null;
    throw error;
  });
  if (!result)
    return refuse(kind, ["The file store is not answering, so nothing was changed. Try again in a minute."], 503);
  if (!result.ok) return refuse(kind, [...result.errors, "Nothing was changed; the current layer is still in use."]);
  const label = LAYER_RULES[kind].label;
  const count = result.eventsRechecked;
  const rechecked = kind === "address_points" ? "" : ` ${count} event${count === 1 ? " was" : "s were"} rechecked.`;
  throw redirect("/geography", {
    headers: await flashHeaders(
      request,
      `${label} replaced with ${featureCountLabel(result.featureCount)}.${rechecked}`,
    ),
  });
}

const featureCountLabel = (count: number) => `${count.toLocaleString("en-US")} feature${count === 1 ? "" : "s"}`;

export default function Geography({ loaderData, actionData }: Route.ComponentProps) {
  const navigation = useNavigation();
  const busyKind = navigation.state === "submitting" ? navigation.formData?.get("kind") : null;
  return (
    <div className="space-y-6">
      <h1 className="text-2xl font-bold">Drainage and waterway layers</h1>
      <p className="max-w-3xl">
        The server places every event against these layers: the drainage basin it lies in, the nearest waterway and
        storm inlet and how far away they are, whether it is within the waterway buffer (
        {loaderData.waterwayBufferM.toLocaleString("en-US")} m), and whether it is outside the jurisdiction. Replacing a
        layer rechecks every event.
      </p>
      <p className="caution max-w-3xl">
        The checks are only as good as these layers. The default waterway buffer is 300 ft (91.44 m), the distance the
        USDA Forest Service aerial-application guide keeps retardant and foam from waterways; ground use has no fixed
        distance, and local rules, permits and licensed practice govern.
      </p>
      <p className="text-sm text-slate-ft">
        Files are GeoJSON (RFC 7946): WGS 84 longitude/latitude, a FeatureCollection, at most{" "}
        {MAX_LAYER_BYTES / 1024 / 1024} MB.
      </p>
      <section className="card max-w-3xl" aria-labelledby="check-point-title">
        <h2 id="check-point-title" className="text-lg font-semibold">
          Check a point
        </h2>
        <p className="text-sm text-slate-ft">
          What an officer sees on the report form for a location, with the layers in use now.
        </p>
        <div className="mt-3">
          <EventLocationMap latitudeName="check_latitude" longitudeName="check_longitude" />
        </div>
      </section>
      <div className="grid gap-4 md:grid-cols-2">
        {loaderData.layers.map((layer) => {
          const errors = actionData?.kind === layer.kind ? actionData.errors : null;
          const errorId = `errors-${layer.kind}`;
          return (
            <section key={layer.kind} className="card space-y-3" aria-labelledby={`layer-${layer.kind}`}>
              <h2 id={`layer-${layer.kind}`} className="text-lg font-semibold">
                {layer.label}
              </h2>
              <p className="text-sm text-slate-ft">{layer.help}</p>
              {layer.featureCount === null ? (
                <p className="text-sm font-semibold text-danger-700">Not loaded yet: these checks show “not known”.</p>
              ) : (
                <p className="text-sm" data-testid={`layer-status-${layer.kind}`}>
                  {featureCountLabel(layer.featureCount)} from <span className="font-medium">{layer.fileName}</span>,
                  uploaded {layer.uploadedAt?.slice(0, 16).replace("T", " ")} UTC by {layer.uploadedBy}.{" "}
                  <a className="text-pond-700 underline" href={`/api/geo/layers/${layer.kind}`} download>
                    Download
                  </a>
                </p>
              )}
              <EarlierFiles
                versions={loaderData.earlier[layer.kind] ?? []}
                hrefOf={(version) => `/geography/layers/${layer.kind}/versions/${version.id}`}
                label={`Earlier files of ${layer.label.toLowerCase()}`}
              />
              <Form method="post" encType="multipart/form-data" className="space-y-2">
                <input type="hidden" name="kind" value={layer.kind} />
                <label className="block">
                  <span className="field-label">New file for {layer.label.toLowerCase()}</span>
                  <input
                    type="file"
                    name="file"
                    accept=".geojson,.json,application/geo+json,application/json"
                    required
                    className="field-input"
                    aria-invalid={errors ? true : undefined}
                    aria-describedby={errors ? errorId : undefined}
                  />
                </label>
                {errors ? (
                  <ul id={errorId} role="alert" className="field-error list-disc pl-5">
                    {errors.map((error) => (
                      <li key={error}>{error}</li>
                    ))}
                  </ul>
                ) : null}
                <button type="submit" className="btn-secondary" disabled={busyKind === layer.kind}>
                  {busyKind === layer.kind ? "Checking and replacing…" : `Replace ${layer.label.toLowerCase()}`}
                </button>
              </Form>
            </section>
          );
        })}
      </div>
    </div>
  );
}
