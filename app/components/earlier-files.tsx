/** A file that was replaced and is still kept, as the earlier-files list shows it. */
export type EarlierFile = {
  id: number;
  fileName: string;
  uploadedAt: string;
  uploadedBy: string | null;
  replacedAt: string | null;
  byteSize: number | null;
  sha256: string | null;
};

const utc = (value: string | null) => (value ? `${value.slice(0, 16).replace("T", " ")} UTC` : "");

/** The replaced versions of a stored file, newest first, each with its download link. */
export function EarlierFiles({
  versions,
  hrefOf,
  label,
}: {
  versions: EarlierFile[];
  hrefOf: (version: EarlierFile) => string;
  label: string;
}) {
  if (versions.length === 0) return null;
  return (
    <details className="text-sm">
      <summary className="cursor-pointer">
        {label} ({versions.length})
      </summary>
      <ul className="mt-2 list-disc space-y-1 pl-5" aria-label={label}>
        {versions.map((version) => (
          <li key={version.id}>
            <a className="text-pond-700 underline" href={hrefOf(version)}>
              {version.fileName}
            </a>{" "}
            — uploaded {utc(version.uploadedAt)}
            {version.uploadedBy ? ` by ${version.uploadedBy}` : ""}, replaced {utc(version.replacedAt)}
            {version.sha256 ? (
              <span className="block text-xs text-slate-ft">SHA-256 {version.sha256.slice(0, 16)}…</span>
            ) : null}
          </li>
        ))}
      </ul>
    </details>
  );
}
