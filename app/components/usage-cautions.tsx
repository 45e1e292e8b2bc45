/** The cautions shown where foam-use decisions are recorded. Local codes, permits and licensed practice govern. */
export function UsageCautions({ kind }: { kind: "pfas" | "class-a" | "runoff" }) {
  if (kind === "pfas") {
    return (
      <div className="caution" role="note" aria-label="PFAS caution">
        <p className="font-semibold">This concentrate contains PFAS.</p>
        <p>
          Contain and collect all foam solution and runoff, keep it out of drains, soil and water, and keep the disposal
          record. PFOA and PFOS are CERCLA hazardous substances with a reportable quantity of 1 lb in 24 hours each (40
          CFR 302.4): a release at or above it must be reported immediately once known (CERCLA §103, EPCRA §304; 40 CFR
          302.6(a), 355.40), and states add their own notice (for example Colorado within 24 hours to its spill line,
          C.R.S. 25-5-1303.5). California bans PFAS Class B foam for training (Health &amp; Safety Code §13062; a
          5-business-day report to the State Fire Marshal appears only in secondary summaries and is unverified).
        </p>
        <p className="font-semibold">
          This report is a record kept afterwards. It is not a notification to any authority.
        </p>
      </div>
    );
  }
  if (kind === "class-a") {
    return (
      <div className="caution" role="note" aria-label="Class A caution">
        Class A concentrates are surfactants that harm fish and other aquatic life at low concentrations (96-hour LC50
        for salmonids 7–22 mg/L for Chinook salmon, Buhl &amp; Hamilton 1998, Environ. Toxicol. Chem. 17:1589; 11–78
        mg/L for rainbow trout, Gaikowski et al. 1996). Keep solution and runoff away from waterways and storm drains.
      </div>
    );
  }
  return (
    <div className="caution" role="note" aria-label="Runoff caution">
      Record where the foam solution went as best you know it. Runoff to a storm drain or surface water usually needs
      prompt notice to the environmental officer; runoff to the sanitary sewer needs notice to the treatment works. A
      release at or above a reportable quantity must be reported immediately (CERCLA §103, EPCRA §304): this report is
      not a notification. These figures are estimates; local codes, permits and licensed practice govern.
    </div>
  );
}
