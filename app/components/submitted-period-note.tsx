/** Says that a report falls in a period already marked submitted, on its page and when it is changed. */
export function SubmittedPeriodNote({
  period,
  changing = false,
}: {
  period: { label: string; submittedAt: string; submittedBy: string };
  changing?: boolean;
}) {
  return (
    <p className="caution" role="note" data-testid="submitted-period">
      This report falls in {period.label}, already marked submitted on {period.submittedAt} by {period.submittedBy}.{" "}
      {changing
        ? "A change saved now is not in the submitted workbook; it is listed under “Changed since submission” on the quarterly page and in later workbooks."
        : "Changes made after that are listed under “Changed since submission” on the quarterly page."}
    </p>
  );
}
