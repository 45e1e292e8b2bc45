import { db } from "~/lib/db.server";
import { computeUsage, type DischargeInput, type UsageResult } from "~/lib/foam/totals";
import { VersionedCache } from "~/lib/versioned-cache";
import { readAgencySettings } from "./agency-settings.server";
import { allCatalogueFacts } from "./catalogue.server";
import { currentDataVersions } from "./data-version.server";
import { foamSystemFactsMap } from "./foam-system-facts.server";

type KeptFacts = Awaited<ReturnType<typeof allCatalogueFacts>> & {
  foamSystems: Awaited<ReturnType<typeof foamSystemFactsMap>>;
  drawdownToleranceShare: number;
};

const keptFacts = new VersionedCache<KeptFacts>(1);

/**
 * Every product's and apparatus's facts and the drawdown tolerance, kept in this process while
 * the catalogue's version stamp is unchanged (any save of a product, apparatus, foam system, station or the
 * settings on any server gives it a new one). One small query per call checks the stamp.
 */
export async function catalogueFactsKept(): Promise<KeptFacts> {
  const { catalogue } = await currentDataVersions(db);
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
export async function computeWithKeptFacts(inputs: DischargeInput[]): Promise<UsageResult> {
  const facts = await catalogueFactsKept();
  return computeUsage(inputs, {
    products: facts.products,
    apparatus: facts.apparatus,
    foamSystems: facts.foamSystems,
    drawdownTolerance: facts.drawdownToleranceShare,
  });
}
