import { useEffect, useId, useRef, useState } from "react";
import { useFetcher } from "react-router";
import { ATTACHMENT_ACCEPT, ATTACHMENT_TYPES_SENTENCE, formatBytes } from "~/lib/attachment-files";
import { ATTACHMENT_KIND_LABELS, type AttachmentKind } from "~/lib/foam/vocabulary";

type Attachment = {
  id: number;
  kind: AttachmentKind;
  name: string;
  contentType: string;
  size: number;
  url: string;
  thumbnailUrl: string | null;
  removeUrl: string;
  uploadedAt: string;
  uploadedBy: string | null;
  position: { latitude: number; longitude: number } | null;
};

type AttachmentList = {
  attachments: Attachment[];
  /** The kinds this owner takes; with one only, the kind picker and the position box are left out. */
  kinds: AttachmentKind[];
  canAttach: boolean;
  maxFileBytes: number;
  maxFiles: number;
};

/** The word for what the files are attached to, as the panel says it. */
type OwnerWord = "report" | "request" | "test" | "movement";

type Upload = {
  key: string;
  file: File;
  kind: AttachmentKind | "";
  usePosition: boolean;
  sent: number;
  state: "waiting" | "sending" | "failed" | "done";
  message?: string;
};

/** Sends one file with XMLHttpRequest, whose upload events give the progress that fetch cannot. */
function sendFile(
  uploadUrl: string,
  upload: Upload,
  onProgress: (sent: number) => void,
): Promise<{ ok: true } | { ok: false; message: string }> {
  return new Promise((resolve) => {
    const body = new FormData();
    if (upload.kind) body.append("kind", upload.kind);
    if (upload.usePosition) body.append("usePosition", "true");
    body.append("file", upload.file, upload.file.name);
    const request = new XMLHttpRequest();
    request.open("POST", uploadUrl);
    request.responseType = "json";
    request.upload.onprogress = (event) => onProgress(event.loaded);
    request.onload = () => {
      if (request.status === 201) return resolve({ ok: true });
      const error = (request.response as { error?: string } | null)?.error;
      resolve({ ok: false, message: error ?? `The server answered ${request.status}; the file was not attached.` });
    };
    request.onerror = () => resolve({ ok: false, message: "The connection was lost; the file was not attached." });
    request.send(body);
  });
}

/** The files attached to a usage report, through the event's attachments API. */
export function EventAttachments({ eventId }: { eventId: number }) {
  return <AttachmentsPanel apiUrl={`/api/events/${eventId}/attachments`} owner="report" />;
}

/** The documents attached to a public-records request, through the request's attachments API. */
export function RequestAttachments({ requestId }: { requestId: number }) {
  return <AttachmentsPanel apiUrl={`/api/records-requests/${requestId}/attachments`} owner="request" />;
}

/** The printouts attached to a proportioner accuracy test. */
export function TestPrintouts({ testId }: { testId: number }) {
  return <AttachmentsPanel apiUrl={`/api/foam-tests/${testId}/attachments`} owner="test" title="Printouts" />;
}

/** The hauler's manifest attached to a disposal of concentrate. */
export function DisposalManifests({ movementId }: { movementId: number }) {
  return (
    <AttachmentsPanel
      apiUrl={`/api/stock/movements/${movementId}/attachments`}
      owner="movement"
      title="Disposal manifest"
      compact
    />
  );
}

/**
 * Attached files: thumbnails of photos, links to documents, and (for those who may attach) a picker
 * for several files at once, each sent on its own with its progress shown and a retry when it fails.
 * `apiUrl` lists the files (GET) and takes one (POST).
 */
function AttachmentsPanel({
  apiUrl,
  owner,
  title = "Attachments",
  compact = false,
}: {
  apiUrl: string;
  owner: OwnerWord;
  title?: string;
  /** Inside a table row: no card, a smaller heading, ids made from the list address. */
  compact?: boolean;
}) {
  const list = useFetcher<AttachmentList>();
  const remove = useFetcher();
  // Several panels may share a page (one per disposal in the movements list).
  const ids = useId();
  const listUrl = apiUrl;
  const [uploads, setUploads] = useState<Upload[]>([]);
  const [kind, setKind] = useState<AttachmentKind | "">("");
  const [usePosition, setUsePosition] = useState(false);
  const queue = useRef<Promise<void>>(Promise.resolve());
  const input = useRef<HTMLInputElement>(null);

  const load = list.load;
  useEffect(() => {
    void load(listUrl);
  }, [load, listUrl]);
  useEffect(() => {
    if (remove.state === "idle" && remove.data) void load(listUrl);
  }, [remove.state, remove.data, load, listUrl]);

  const update = (key: string, change: Partial<Upload>) =>
    setUploads((current) => current.map((entry) => (entry.key === key ? { ...entry, ...change } : entry)));

  // One file at a time, in the order chosen; a retry waits for the files before it.
  function sendAll(entries: Upload[]) {
    queue.current = queue.current.then(() => sendEach(entries));
  }

  async function sendEach(entries: Upload[]) {
    for (const entry of entries) {
      update(entry.key, { state: "sending", sent: 0, message: undefined });
      const result = await sendFile(apiUrl, entry, (sent) => update(entry.key, { sent }));
      if (result.ok) update(entry.key, { state: "done", sent: entry.file.size });
      else update(entry.key, { state: "failed", message: result.message });
      if (result.ok) void load(listUrl);
    }
  }

  function choose(files: FileList | null) {
    if (!files || files.length === 0) return;
    const chosen = Array.from(files).map((file, index) => ({
      key: `${Date.now()}-${index}-${file.name}`,
      file,
      kind,
      usePosition,
      sent: 0,
      state: "waiting" as const,
    }));
    setUploads((current) => [...current.filter((entry) => entry.state !== "done"), ...chosen]);
    if (input.current) input.current.value = "";
    sendAll(chosen);
  }

  const data = list.data;
  const attachments = data?.attachments ?? [];
  return (
    <section className={compact ? "space-y-2" : "card"} aria-labelledby={`${ids}-title`} data-testid="attachments">
      {compact ? (
        <h3 id={`${ids}-title`} className="font-semibold">
          {title}
        </h3>
      ) : (
        <h2 id={`${ids}-title`} className="text-lg font-semibold">
          {title}
        </h2>
      )}
      {data ? (
        attachments.length === 0 ? (
          <p className="mt-2 text-sm text-slate-ft">No files are attached to this {owner}.</p>
        ) : (
          <ul className="mt-3 grid gap-3 sm:grid-cols-2 lg:grid-cols-3" aria-label="Attached files">
            {attachments.map((attachment) => (
              <li key={attachment.id} className="rounded border border-slate-300 p-2" data-testid="attachment">
                <a href={attachment.url} className="block" target="_blank" rel="noreferrer">
                  {attachment.thumbnailUrl ? (
                    <img
                      src={attachment.thumbnailUrl}
                      alt={`Thumbnail of ${attachment.name}`}
                      className="h-32 w-full rounded bg-slate-100 object-contain"
                      loading="lazy"
                    />
                  ) : (
                    <span className="flex h-32 w-full items-center justify-center rounded bg-slate-100 text-sm font-semibold">
                      PDF document
                    </span>
                  )}
                  <span className="mt-1 block truncate font-medium underline">{attachment.name}</span>
                </a>
                <p className="text-sm text-slate-ft">
                  {ATTACHMENT_KIND_LABELS[attachment.kind]} · {formatBytes(attachment.size)}
                  {attachment.uploadedBy ? ` · ${attachment.uploadedBy}` : ""}
                </p>
                {attachment.position ? (
                  <p className="text-sm text-slate-ft">
                    Photo position {attachment.position.latitude}, {attachment.position.longitude}
                  </p>
                ) : null}
                {data.canAttach ? (
                  <remove.Form method="post" action={attachment.removeUrl} className="mt-1">
                    <input type="hidden" name="intent" value="remove" />
                    <button type="submit" className="text-sm underline" aria-label={`Remove ${attachment.name}`}>
                      Remove
                    </button>
                  </remove.Form>
                ) : null}
              </li>
            ))}
          </ul>
        )
      ) : (
        <p className="mt-2 text-sm text-slate-ft">Loading attachments…</p>
      )}
      {data?.canAttach ? (
        <div className="mt-4 space-y-3 border-t border-slate-200 pt-3">
          {data.kinds.length > 1 ? (
            <div className="flex flex-wrap items-end gap-4">
              <div>
                <label htmlFor={`${ids}-kind`} className="field-label">
                  Kind of file
                </label>
                <select
                  id={`${ids}-kind`}
                  className="field-input"
                  value={kind}
                  onChange={(event) => setKind(event.target.value as AttachmentKind | "")}
                >
                  <option value="">Photo for images, other for documents</option>
                  {data.kinds.map((value) => (
                    <option key={value} value={value}>
                      {ATTACHMENT_KIND_LABELS[value]}
                    </option>
                  ))}
                </select>
              </div>
              <label className="flex items-center gap-2 text-sm">
                <input
                  type="checkbox"
                  checked={usePosition}
                  onChange={(event) => setUsePosition(event.target.checked)}
                />
                Keep each photo&apos;s recorded position with it
              </label>
            </div>
          ) : null}
          <div>
            <label htmlFor={`${ids}-files`} className="field-label">
              {data.kinds.length === 1
                ? `Attach ${ATTACHMENT_KIND_LABELS[data.kinds[0]].toLowerCase()}s`
                : "Attach files"}
            </label>
            <input
              id={`${ids}-files`}
              ref={input}
              type="file"
              multiple
              accept={ATTACHMENT_ACCEPT}
              className="field-input"
              aria-describedby={`${ids}-files-hint`}
              onChange={(event) => choose(event.target.files)}
            />
            <p id={`${ids}-files-hint`} className="mt-1 text-sm text-slate-ft">
              {ATTACHMENT_TYPES_SENTENCE}, at most {formatBytes(data.maxFileBytes)} each and {data.maxFiles} on a{" "}
              {owner}.
              {data.kinds.length > 1
                ? " Photos are stored without their location and camera data unless you keep the position."
                : " Photos are stored without their location and camera data."}
              {owner === "report"
                ? " They show where the runoff went and may show people: attach what the record needs."
                : ""}
            </p>
          </div>
          {uploads.length > 0 ? (
            <ul className="space-y-2" aria-label="Files being attached">
              {uploads.map((entry) => (
                <li key={entry.key} className="text-sm" data-testid="upload">
                  <div className="flex flex-wrap items-center gap-2">
                    <span className="font-medium">{entry.file.name}</span>
                    <progress
                      max={entry.file.size || 1}
                      value={entry.state === "done" ? entry.file.size || 1 : entry.sent}
                      aria-label={`Progress of ${entry.file.name}`}
                    />
                    <span>
                      {entry.state === "waiting"
                        ? "Waiting"
                        : entry.state === "sending"
                          ? `${Math.round((entry.sent / (entry.file.size || 1)) * 100)} %`
                          : entry.state === "done"
                            ? "Attached"
                            : "Not attached"}
                    </span>
                    {entry.state === "failed" ? (
                      <button type="button" className="btn-secondary" onClick={() => sendAll([entry])}>
                        Try again
                      </button>
                    ) : null}
                  </div>
                  {entry.message ? (
                    <p className="text-red-800" role="alert">
                      {entry.message}
                    </p>
                  ) : null}
                </li>
              ))}
            </ul>
          ) : null}
        </div>
      ) : null}
    </section>
  );
}
