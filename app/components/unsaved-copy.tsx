import { useCallback, useEffect, useRef, useState } from "react";
import { useActionData, useBlocker, useLocation, useNavigation, useParams, useRouteLoaderData } from "react-router";
import {
  clearUnsavedCopy,
  fieldEntriesOf,
  readUnsavedCopy,
  sameEntries,
  SIGNING_OUT_EVENT,
  unsavedCopyKey,
  writeUnsavedCopy,
  type FieldEntries,
  type UnsavedCopy,
} from "~/lib/unsaved-copy";

type RootData = { user: { id: number } | null } | undefined;

/** The pages a saved or filed report lands on; a redirect anywhere else (sign-in) saved nothing. */
const SAVED_REPORT_PAGE = /^\/events\/\d+(\/edit)?$/;
const SAVE_INTENTS = new Set(["save-draft", "file"]);

function browserStorage(): Storage | null {
  try {
    return window.localStorage;
  } catch {
    return null;
  }
}

function entriesOfForm(form: HTMLFormElement): FieldEntries {
  return fieldEntriesOf(new FormData(form));
}

/**
 * Keeps an unsaved copy of the report form in this browser while someone types, offers it back
 * when the form opens again, and asks before leaving with changes that are not saved. The copy is
 * the whole form serialized, so every field is kept, whoever added it. It is removed once the
 * report is saved or filed, and on sign-out.
 */
export function useUnsavedReportCopy({
  formId,
  baseVersion,
  onRestore,
}: {
  formId: string;
  baseVersion?: number;
  onRestore: (entries: FieldEntries) => void;
}) {
  const root = useRouteLoaderData("root") as RootData;
  const params = useParams();
  const reportId = params.id && /^\d+$/.test(params.id) ? Number(params.id) : "new";
  const key = root?.user ? unsavedCopyKey(root.user.id, reportId) : null;
  const [offer, setOffer] = useState<UnsavedCopy | null>(null);
  const [dirty, setDirtyState] = useState(false);
  const dirtyNow = useRef(false);
  const setDirty = useCallback((next: boolean) => {
    if (dirtyNow.current === next) return;
    dirtyNow.current = next;
    setDirtyState(next);
  }, []);
  const baseline = useRef<FieldEntries | null>(null);
  const offerPending = useRef(false);
  const signingOut = useRef(false);

  const formElement = useCallback(() => document.getElementById(formId) as HTMLFormElement | null, [formId]);

  // On opening: what the page shows is the baseline; a different copy kept here is offered.
  useEffect(() => {
    const form = formElement();
    const storage = browserStorage();
    if (!form || !storage || !key) return;
    baseline.current = entriesOfForm(form);
    const copy = readUnsavedCopy(storage, key);
    if (copy && !sameEntries(copy.entries, baseline.current)) {
      offerPending.current = true;
      setOffer(copy);
    } else if (copy) {
      clearUnsavedCopy(storage, key);
    }
  }, [formElement, key]);

  const keepCopy = useCallback(() => {
    const form = formElement();
    const storage = browserStorage();
    // While a copy is on offer it is not overwritten: the choice comes first.
    if (!form || !storage || !key || !baseline.current || offerPending.current || signingOut.current) return;
    const entries = entriesOfForm(form);
    if (sameEntries(entries, baseline.current)) {
      clearUnsavedCopy(storage, key);
      setDirty(false);
      return;
    }
    writeUnsavedCopy(storage, key, { savedAt: new Date().toISOString(), baseVersion: baseVersion ?? null, entries });
    setDirty(true);
  }, [formElement, key, baseVersion, setDirty]);

  // Every keystroke and choice, and every line added or removed, keeps the copy up to date.
  // (Nothing here sets state unless it changes: a render per keystroke would hold up navigation.)
  useEffect(() => {
    const form = formElement();
    if (!form) return;
    let timer: ReturnType<typeof setTimeout> | undefined;
    const schedule = () => {
      clearTimeout(timer);
      timer = setTimeout(keepCopy, 0);
    };
    const typed = () => {
      signingOut.current = false;
      schedule();
    };
    const onSigningOut = () => {
      signingOut.current = true;
      clearTimeout(timer);
    };
    form.addEventListener("input", typed);
    form.addEventListener("change", typed);
    window.addEventListener(SIGNING_OUT_EVENT, onSigningOut);
    // Lines added or removed change the fields without an input event.
    const observer = new MutationObserver(schedule);
    observer.observe(form, { childList: true, subtree: true });
    return () => {
      clearTimeout(timer);
      observer.disconnect();
      form.removeEventListener("input", typed);
      form.removeEventListener("change", typed);
      window.removeEventListener(SIGNING_OUT_EVENT, onSigningOut);
    };
  }, [formElement, keepCopy]);

  // A save that worked redirects: to another page (the copy goes with the page), or back to this
  // edit page with no answer from the action. A refusal answers with its errors and keeps the copy.
  const navigation = useNavigation();
  const location = useLocation();
  const actionData = useActionData();
  const saving = useRef(false);
  useEffect(() => {
    const storage = browserStorage();
    const intent = navigation.formData?.get("intent");
    if (navigation.state === "submitting" && typeof intent === "string" && SAVE_INTENTS.has(intent)) {
      saving.current = true;
    }
    if (!storage || !key || !saving.current) return;
    const saved = () => {
      clearUnsavedCopy(storage, key);
      const form = formElement();
      if (form) baseline.current = entriesOfForm(form);
      setDirty(false);
    };
    if (navigation.state === "loading" && navigation.formData) {
      const target = navigation.location.pathname;
      if (target !== location.pathname && SAVED_REPORT_PAGE.test(target)) saved();
    }
    if (navigation.state === "idle") {
      saving.current = false;
      if (actionData == null && SAVED_REPORT_PAGE.test(location.pathname)) saved();
    }
  }, [navigation, location.pathname, actionData, key, formElement, setDirty]);

  // Leaving with changes asks first: inside the app through the router, and on reload or closing.
  // (A save posts to this page's own address, so it is never held here.)
  const formPath = location.pathname;
  const blocker = useBlocker(
    ({ currentLocation, nextLocation }) =>
      dirty && currentLocation.pathname === formPath && nextLocation.pathname !== formPath,
  );
  useEffect(() => {
    const onBeforeUnload = (event: BeforeUnloadEvent) => {
      if (!dirtyNow.current) return;
      event.preventDefault();
      // Older browsers need a return value to ask at all.
      event.returnValue = "";
    };
    window.addEventListener("beforeunload", onBeforeUnload);
    return () => window.removeEventListener("beforeunload", onBeforeUnload);
  }, []);

  const restore = () => {
    if (!offer) return;
    offerPending.current = false;
    setOffer(null);
    onRestore(offer.entries);
  };
  const discard = () => {
    const storage = browserStorage();
    if (storage && key) clearUnsavedCopy(storage, key);
    offerPending.current = false;
    setOffer(null);
  };

  return { offer, restore, discard, blocker, dirty, baseVersion };
}

/** Sets a field's value as typing would, so that React and the form library both see it. */
function setFieldValue(element: HTMLInputElement | HTMLTextAreaElement | HTMLSelectElement, value: string) {
  const prototype = Object.getPrototypeOf(element) as object;
  const setter = Object.getOwnPropertyDescriptor(prototype, "value")?.set;
  if (setter) setter.call(element, value);
  else element.value = value;
  element.dispatchEvent(new Event("input", { bubbles: true }));
  element.dispatchEvent(new Event("change", { bubbles: true }));
}

/**
 * Puts kept values into the fields the form library does not draw from its own value (fields drawn
 * by a component of their own, such as the map's coordinates, or plain fields added to the form).
 */
export function fillFields(form: HTMLFormElement, entries: FieldEntries) {
  const kept = new Map<string, string[]>();
  for (const [name, value] of entries) kept.set(name, [...(kept.get(name) ?? []), value]);
  for (const element of Array.from(form.elements)) {
    if (
      !(element instanceof HTMLInputElement) &&
      !(element instanceof HTMLTextAreaElement) &&
      !(element instanceof HTMLSelectElement)
    )
      continue;
    const values = kept.get(element.name);
    if (!element.name || !values || element.disabled) continue;
    if (element instanceof HTMLInputElement && (element.type === "checkbox" || element.type === "radio")) {
      const checked = values.includes(element.value);
      if (element.checked !== checked) element.click();
      continue;
    }
    if (element instanceof HTMLInputElement && ["file", "submit", "button", "hidden"].includes(element.type)) continue;
    if (element.value !== values[0]) setFieldValue(element, values[0]);
  }
}

/** The offer of a copy kept on this device, made when the form opens. */
export function UnsavedCopyOffer({
  copy,
  timeZone,
  currentVersion,
  onRestore,
  onDiscard,
}: {
  copy: UnsavedCopy;
  timeZone: string;
  currentVersion?: number;
  onRestore: () => void;
  onDiscard: () => void;
}) {
  const when = new Date(copy.savedAt).toLocaleString("en-US", {
    timeZone,
    dateStyle: "medium",
    timeStyle: "short",
  });
  const newer = currentVersion != null && copy.baseVersion != null && copy.baseVersion !== currentVersion;
  return (
    <section className="caution space-y-2" role="region" aria-labelledby="unsaved-copy-title">
      <h2 id="unsaved-copy-title" className="font-semibold">
        Unsaved typing kept on this device
      </h2>
      <p>
        This device kept what you typed in this report on <time dateTime={copy.savedAt}>{when}</time>, and it was never
        saved to Foamtally. Bring it back into the form, or throw it away and keep the report as shown.
      </p>
      {newer ? (
        <p className="font-medium">
          The report has been saved since then. Bringing the typing back replaces what is shown with the older typing.
        </p>
      ) : null}
      <div className="flex flex-wrap gap-2">
        <button type="button" className="btn-primary" onClick={onRestore}>
          Bring back my typing
        </button>
        <button type="button" className="btn-secondary" onClick={onDiscard}>
          Throw it away
        </button>
      </div>
    </section>
  );
}

/** Asks before leaving the form with changes that are not saved. */
export function LeaveDialog({ blocker }: { blocker: ReturnType<typeof useBlocker> }) {
  const stay = useRef<HTMLButtonElement>(null);
  const blocked = blocker.state === "blocked";
  useEffect(() => {
    if (blocked) stay.current?.focus();
  }, [blocked]);
  if (!blocked) return null;
  return (
    <div className="fixed inset-0 z-50 flex items-center justify-center bg-ink/40 p-4">
      <div
        role="alertdialog"
        aria-modal="true"
        aria-labelledby="leave-title"
        aria-describedby="leave-text"
        className="max-w-md rounded-lg border border-stone-300 bg-white p-6 shadow-lg"
        onKeyDown={(event) => {
          if (event.key === "Escape") blocker.reset();
        }}
      >
        <h2 id="leave-title" className="text-lg font-semibold">
          Leave this report?
        </h2>
        <p id="leave-text" className="mt-2 text-sm">
          Your changes are not saved to Foamtally yet. A copy stays on this device and is offered again when you open
          the report.
        </p>
        <div className="mt-4 flex flex-wrap gap-2">
          <button ref={stay} type="button" className="btn-primary" onClick={() => blocker.reset()}>
            Stay on the report
          </button>
          <button type="button" className="btn-secondary" onClick={() => blocker.proceed()}>
            Leave
          </button>
        </div>
      </div>
    </div>
  );
}
