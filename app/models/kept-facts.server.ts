import { db } from "~/lib/db.server";
import { computeUsage, type DischargeInput, type UsageResult } from "~/lib/foam/totals";
import { VersionedCache } from "~/lib/versioned-cache";
import { readAgencySettings } from "./agency-settings.server";
import { allCatalogueFacts } from "./catalogue.server";
import { foamSystemFactsMap } from "./foam-system-facts.server";
import { dataVersionsForRead } from "./read-versions.server";

type KeptFacts = Awaited<ReturnType<typeof allCatalogueFacts>> & {
  foamSystems: Awaited<ReturnType<typeof foamSystemFactsMap>>;
  drawdownToleranceShare: number;
};

const keptFacts = new VersionedCache<KeptFacts>(1);

/**
 * Every product's and apparatus's facts and the drawdown tolerance, kept in this process while
 * the catalogue's version stamp is unchanged (any save of a product, apparatus, foam system, station or the
 * settings on any server gives it a new one), checked against the stamp read with the request's
 * session.
 */
export async function catalogueFactsKept(request: Request): Promise<KeptFacts> {
  const { catalogue } = await dataVersionsForRead(request);
  return keptFacts.get("catalogue", catalogue, async () => {
    const [facts, settings, foamSystems] = await Promise.all([
      allCatalogueFacts(db),
      readAgencySettings(db),
      foamSystemFactsMap(db),
    ]);
    return { ...facts, foamSystems, drawdownToleranceShare: settings.drawdownToleranceShare };
  });
}

/**
 * What `computeForInputs` answers for lines without tank readings or event times (the report
 * form's live totals, `POST /api/totals`), from the kept catalogue facts. Saves never use it: they
 * read the facts inside their own transaction.
 */
export async function computeWithKeptFacts(request: Request, inputs: DischargeInput[]): Promise<UsageResult> {
  const facts = await catalogueFactsKept(request);
  return computeUsage(inputs, {
    products: facts.products,
    apparatus: facts.apparatus,
    foamSystems: facts.foamSystems,
    drawdownTolerance: facts.drawdownToleranceShare,
  });
}
