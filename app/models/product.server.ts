import { randomUUID } from "node:crypto";
import { recordAudit } from "~/lib/audit.server";
import type { SessionUser } from "~/lib/auth.server";
import type { ProductFormValue } from "~/lib/catalogue/product-form";
import { StaleRecordError } from "~/lib/catalogue/record-version";
import { decimalOrNull } from "~/lib/decimal";
import { db } from "~/lib/db.server";
import type { FoamClass, FoamType, PfasContentUnit } from "~/lib/foam/vocabulary";
import { deleteObjectQuietly, putObject } from "~/lib/storage.server";
import { productColumns } from "./catalogue-rows.server";
import { refreshFoamClassTotals } from "./report-rows.server";
import { nominalPercentsOf } from "./catalogue.server";
import { describeFile, recordNewVersion, type StoredFile } from "./file-versions.server";
import { bumpDataVersion } from "./data-version.server";

export type ProductRecord = {
  id: number;
  name: string;
  maker: string;
  foamClass: FoamClass;
  foamType: FoamType;
  nominalPercents: number[];
  pfasContaining: boolean;
  pfasContent: number | null;
  pfasContentUnit: PfasContentUnit | null;
  pfoaContent: number | null;
  pfoaContentUnit: PfasContentUnit | null;
  pfosContent: number | null;
  pfosContentUnit: PfasContentUnit | null;
  pfasContentBasis: string | null;
  pfasContentSource: string | null;
  unitCostPerGal: number | null;
  safetySheetName: string | null;
  hasSafetySheet: boolean;
  active: boolean;
  heldForDisposal: boolean;
  shelfLifeMonths: number | null;
  notes: string | null;
  /** Raised by every save; an edit must name the version it started from. */
  version: number;
};

function recordOf(row: Record<string, unknown>): ProductRecord {
  return {
    id: row.id as number,
    name: row.name as string,
    maker: (row.maker as string) ?? "",
    foamClass: row.foam_class as FoamClass,
    foamType: row.foam_type as FoamType,
    nominalPercents: nominalPercentsOf(row.nominal_percents as string),
    pfasContaining: Boolean(row.pfas_containing),
    pfasContent: decimalOrNull(row.pfas_content),
    pfasContentUnit: (row.pfas_content_unit as PfasContentUnit | null) ?? null,
    pfoaContent: decimalOrNull(row.pfoa_content),
    pfoaContentUnit: (row.pfoa_content_unit as PfasContentUnit | null) ?? null,
    pfosContent: decimalOrNull(row.pfos_content),
    pfosContentUnit: (row.pfos_content_unit as PfasContentUnit | null) ?? null,
    pfasContentBasis: (row.pfas_content_basis as string | null) ?? null,
    pfasContentSource: (row.pfas_content_source as string | null) ?? null,
    unitCostPerGal: decimalOrNull(row.unit_cost_per_gal),
    safetySheetName: (row.safety_sheet_name as string | null) ?? null,
    hasSafetySheet: Boolean(row.safety_sheet_key),
    active: Boolean(row.active),
    heldForDisposal: Boolean(row.held_for_disposal),
    shelfLifeMonths: row.shelf_life_months == null ? null : Number(row.shelf_life_months),
    notes: (row.notes as string | null) ?? null,
    version: Number(row.version ?? 1),
  };
}

export async function listProducts(): Promise<ProductRecord[]> {
  const rows = await db("foam_products").orderBy([{ column: "active", order: "desc" }, "name"]);
  return rows.map(recordOf);
}

export async function getProduct(id: number): Promise<ProductRecord | null> {
  const row = await db("foam_products").where({ id }).first();
  return row ? recordOf(row) : null;
}

export async function getSafetySheetKey(id: number): Promise<{ key: string; name: string } | null> {
  const row = await db("foam_products").where({ id }).first("safety_sheet_key", "safety_sheet_name");
  return row?.safety_sheet_key
    ? { key: row.safety_sheet_key, name: row.safety_sheet_name ?? "safety-sheet.pdf" }
    : null;
}

export class DuplicateProductNameError extends Error {}

export type SafetySheetUpload = { name: string; contentType: string; body: Uint8Array };

/**
 * Creates (id null) or updates a product with its audit row in one transaction. A new safety sheet
 * is stored first; if the database save then fails, the stored file is removed again.
 * An update must name the version it was opened with (`expectedVersion`); a stale or missing one
 * throws StaleRecordError and changes nothing. Returns the id, or null when the product does not exist.
 */
export async function saveProduct(
  id: number | null,
  expectedVersion: number | null,
  value: ProductFormValue,
  safetySheet: SafetySheetUpload | null,
  actor: SessionUser,
  clientAddress?: string,
): Promise<number | null> {
  let sheetKey: string | null = null;
  let sheetFile: StoredFile | null = null;
  if (safetySheet) {
    sheetKey = `safety-sheets/${randomUUID()}.pdf`;
    sheetFile = describeFile(sheetKey, safetySheet.name, safetySheet.contentType, safetySheet.body);
    await putObject(sheetKey, safetySheet.body, safetySheet.contentType);
  }
  try {
    return await db.transaction(async (trx) => {
      const current = id == null ? null : await trx("foam_products").where({ id }).forUpdate().first();
      if (id != null && !current) return null;
      if (current && Number(current.version) !== expectedVersion) {
        throw new StaleRecordError(Number(current.version), expectedVersion);
      }
      const clash = await trx("foam_products")
        .where({ name: value.name })
        .modify((query) => {
          if (id != null) query.whereNot({ id });
        })
        .first("id");
      if (clash) throw new DuplicateProductNameError(value.name);
      const columns = {
        ...productColumns(value),
        ...(sheetKey ? { safety_sheet_key: sheetKey, safety_sheet_name: safetySheet!.name } : {}),
      };
      let savedId: number;
      let before: ProductRecord | undefined;
      if (id == null) {
        [savedId] = await trx("foam_products").insert(columns);
      } else {
        before = recordOf(current!);
        await trx("foam_products")
          .where({ id, version: expectedVersion })
          .update({ ...columns, version: Number(current!.version) + 1 });
        savedId = id;
      }
      await bumpDataVersion(trx, "catalogue");
      if (current && current.foam_class !== columns.foam_class) {
        // Events keep their concentrate by class: those that used this product are summed again.
        await refreshFoamClassTotals(trx, { productId: savedId });
        await bumpDataVersion(trx, "reports");
      }
      const after = recordOf((await trx("foam_products").where({ id: savedId }).first())!);
      // Each sheet keeps its own key: the one replaced stays in the file store and is listed as earlier.
      const replacedSheet = sheetFile
        ? await recordNewVersion("safety_sheet", String(savedId), sheetFile, actor.id, trx, async () =>
            current?.safety_sheet_key
              ? {
                  key: current.safety_sheet_key,
                  fileName: current.safety_sheet_name ?? "safety-sheet.pdf",
                  contentType: "application/pdf",
                  byteSize: null,
                  sha256: null,
                }
              : null,
          )
        : null;
      await recordAudit(
        {
          actorUserId: actor.id,
          actorLabel: actor.email,
          action: id == null ? "product_created" : "product_updated",
          entityType: "foam_product",
          entityId: savedId,
          summary: sheetKey
            ? `${value.name}; safety sheet ${safetySheet!.name}${replacedSheet ? ` replaces ${replacedSheet.fileName}` : ""}`
            : value.name,
          before: before && sheetFile ? { ...before, safetySheetFile: replacedSheet } : before,
          after: sheetFile ? { ...after, safetySheetFile: sheetFile } : after,
          clientAddress,
        },
        trx,
      );
      return savedId;
    });
  } catch (error) {
    if (sheetKey) await deleteObjectQuietly(sheetKey);
    throw error;
  }
}
