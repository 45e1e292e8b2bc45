/** The cautions shown where foam-use decisions are recorded. Local codes, permits and licensed practice govern. */
export function UsageCautions({ kind }: { kind: "pfas" | "class-a" | "runoff" }) {
  if (kind === "pfas") {
    return (
      <div className="caution" role="note" aria-label="PFAS caution">
        <p className="font-semibold">This concentrate contains PFAS.</p>
        <p>
          Contain and collect all foam solution and runoff, keep it out of drains, soil and water, and keep the disposal
          record. PFOA and PFOS are CERCLA hazardous substances with a reportable quantity of 1 lb in 24 hours (40 CFR
          302.4, 302.6), and several states require a report within days of any use or release (for example Colorado
          within 24 hours, C.R.S. 25-5-1303.5; California within 5 business days, Health &amp; Safety Code §13062). Your
          local rules and permits decide what you must report and to whom.
        </p>
      </div>
    );
  }
  if (kind === "class-a") {
    return (
      <div className="caution" role="note" aria-label="Class A caution">
        Class A concentrates are surfactants that harm fish and other aquatic life at low concentrations (96-hour LC50
        for salmonids roughly 7–78 mg/L; Buhl &amp; Hamilton 1998, Environ. Toxicol. Chem. 17:1589). Keep solution and
        runoff away from waterways and storm drains.
      </div>
    );
  }
  return (
    <div className="caution" role="note" aria-label="Runoff caution">
      Record where the foam solution went as best you know it. Runoff to a storm drain or surface water usually needs
      prompt notice to the environmental officer; runoff to the sanitary sewer needs notice to the treatment works.
      These figures are estimates; local codes, permits and licensed practice govern.
    </div>
  );
}
