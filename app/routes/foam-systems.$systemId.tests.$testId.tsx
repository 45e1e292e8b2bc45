import { Link } from "react-router";
import type { Route } from "./+types/foam-systems.$systemId.tests.$testId";
import { TestPrintouts } from "~/components/attachments-panel";
import { requireCapability } from "~/lib/access.server";
import { ACCURACY_TEST_METHOD_LABELS, FOAM_CLASS_LABELS, FOAM_SYSTEM_TYPE_LABELS } from "~/lib/foam/vocabulary";
import { invariantResponse, requireRecordId } from "~/lib/http.server";
import { getAccuracyTest } from "~/models/foam-system.server";

export const meta: Route.MetaFunction = ({ data }) => [
  {
    title: `${data?.test ? `Accuracy test ${data.test.apparatus} ${data.test.systemName}` : "Accuracy test"} · Foamtally`,
  },
];

/** One accuracy test: its result, its printable record and its attached printouts. */
export async function loader({ request, params }: Route.LoaderArgs) {
  await requireCapability(request, "systems.read");
  const systemId = requireRecordId(request, params.systemId, "No such foam system.");
  const testId = requireRecordId(request, params.testId, "No such test.");
  const test = await getAccuracyTest(systemId, testId);
  invariantResponse(test, "No such test.");
  return { systemId, test };
}

export default function AccuracyTestPage({ loaderData }: Route.ComponentProps) {
  const { systemId, test } = loaderData;
  return (
    <div className="space-y-4">
      <p className="text-sm">
        <Link to={`/foam-systems/${systemId}`} className="text-pond-700 underline">
          {test.apparatus} · {test.systemName}
        </Link>
      </p>
      <h1 className="text-2xl font-semibold">Accuracy test of {test.testedAt.replace("T", " ")}</h1>
      <section className="card" aria-labelledby="result-title">
        <h2 id="result-title" className="text-lg font-semibold">
          Result
        </h2>
        <dl className="mt-2 grid gap-x-6 gap-y-1 sm:grid-cols-2">
          <dt className="font-semibold">System</dt>
          <dd>{FOAM_SYSTEM_TYPE_LABELS[test.systemType]}</dd>
          <dt className="font-semibold">Method</dt>
          <dd>{ACCURACY_TEST_METHOD_LABELS[test.method]}</dd>
          <dt className="font-semibold">Foam</dt>
          <dd>
            {test.ratedPercent} % {FOAM_CLASS_LABELS[test.foamClass]}
            {test.product ? `, ${test.product}` : ""}
          </dd>
          <dt className="font-semibold">Achieved</dt>
          <dd>{Number(test.achievedPercent.toFixed(3))} % of foam solution</dd>
          <dt className="font-semibold">Band</dt>
          <dd>
            {test.band[0]}–{test.band[1]} %
          </dd>
          <dt className="font-semibold">Verdict</dt>
          <dd data-testid="test-verdict" className={test.pass ? undefined : "font-semibold text-red-800"}>
            {test.pass ? "Pass" : "Fail"}
          </dd>
          <dt className="font-semibold">Tester</dt>
          <dd>{test.testedBy}</dd>
        </dl>
        {test.notes ? <p className="mt-2 text-sm">Notes: {test.notes}</p> : null}
        <p className="mt-3">
          <a href={`/foam-systems/${systemId}/tests/${test.id}/record.pdf`} className="text-pond-700 underline">
            Printable test record (PDF)
          </a>
        </p>
      </section>
      <TestPrintouts testId={test.id} />
    </div>
  );
}
