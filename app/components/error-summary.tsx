import { useEffect, useLayoutEffect, useRef, useState } from "react";

type SummaryEntry = { key: string; targetId: string; label: string; message: string };

/** The field or list a conform error name points at, and the words a person knows it by. */
function describe(formId: string, name: string): { target: HTMLElement; label: string } | null {
  const form = document.getElementById(formId);
  const named = form instanceof HTMLFormElement ? form.elements.namedItem(name) : null;
  const control = document.getElementById(`${formId}-${name}`) ?? (named instanceof HTMLElement ? named : null);
  if (control) {
    // A field drawn by a component of its own may have no id for the link to point at.
    if (!control.id) control.id = `${formId}-${name}`;
    const wrapping = control.closest("label");
    const labelText =
      document.querySelector(`label[for="${CSS.escape(control.id)}"]`)?.textContent?.trim() ||
      wrapping?.querySelector(".field-label")?.textContent?.trim() ||
      control.getAttribute("aria-label") ||
      name;
    const group = control.closest("li[aria-label]")?.getAttribute("aria-label");
    return { target: control, label: group ? `${group} · ${labelText}` : labelText };
  }
  // A list's own error (say, runoff shares that do not add up) is shown above the list.
  const listError = document.getElementById(`${formId}-${name}-error`);
  if (!listError) return null;
  const heading = listError.closest("section")?.querySelector("h2")?.textContent?.trim();
  return { target: listError, label: heading || name };
}

/**
 * Every problem of a refused filing at the top of the form, each a link to its field, in the
 * order the fields come. Focus moves here on each refused attempt (`attempt` changes); the list
 * shrinks as fields are fixed. Generic over the form's fields: it reads names, labels and ids
 * from the page.
 */
export function ErrorSummary({
  formId,
  errors,
  attempt,
}: {
  formId: string;
  errors: Record<string, string[] | undefined> | undefined;
  attempt: number;
}) {
  const [entries, setEntries] = useState<SummaryEntry[]>([]);
  const box = useRef<HTMLDivElement>(null);
  const focusPending = useRef(false);
  const errorKey = JSON.stringify(errors ?? {});

  useLayoutEffect(() => {
    if (attempt === 0) return;
    const found: Array<SummaryEntry & { target: HTMLElement }> = [];
    for (const [name, messages] of Object.entries(errors ?? {})) {
      if (!name || !messages?.length) continue;
      const described = describe(formId, name);
      if (!described) continue;
      for (const message of messages) {
        found.push({
          key: `${name}:${message}`,
          targetId: described.target.id,
          label: described.label,
          message,
          target: described.target,
        });
      }
    }
    found.sort((a, b) =>
      a.target === b.target
        ? 0
        : a.target.compareDocumentPosition(b.target) & Node.DOCUMENT_POSITION_FOLLOWING
          ? -1
          : 1,
    );
    setEntries(found.map(({ target: _target, ...entry }) => entry));
    // errorKey stands for errors: the same errors in a new object are not a change.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [errorKey, formId, attempt]);

  useEffect(() => {
    if (attempt > 0) focusPending.current = true;
  }, [attempt]);
  useEffect(() => {
    if (!focusPending.current || entries.length === 0) return;
    focusPending.current = false;
    // After the form library has put focus on the first field it marked.
    const timer = setTimeout(() => box.current?.focus(), 0);
    return () => clearTimeout(timer);
  }, [entries]);

  if (attempt === 0 || entries.length === 0) return null;
  return (
    <div
      ref={box}
      tabIndex={-1}
      role="group"
      aria-labelledby={`${formId}-summary-title`}
      data-testid="error-summary"
      className="rounded-md border-2 border-danger-700 bg-danger-50 p-4 text-danger-700"
    >
      <h2 id={`${formId}-summary-title`} className="text-lg font-semibold">
        {entries.length === 1 ? "1 thing to fix before filing" : `${entries.length} things to fix before filing`}
      </h2>
      <ul className="mt-2 list-disc space-y-1 pl-5">
        {entries.map((entry) => (
          <li key={entry.key}>
            <a
              href={`#${entry.targetId}`}
              className="font-medium underline underline-offset-2"
              onClick={(event) => {
                const target = document.getElementById(entry.targetId);
                if (!target) return;
                event.preventDefault();
                if (!target.matches("input, select, textarea, button")) target.setAttribute("tabindex", "-1");
                target.focus();
              }}
            >
              {entry.label}: {entry.message}
            </a>
          </li>
        ))}
      </ul>
    </div>
  );
}
