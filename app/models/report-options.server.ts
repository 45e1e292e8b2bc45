import { db } from "~/lib/db.server";
import { readAgencySettings } from "./agency-settings.server";
import { listActiveApparatus, listActiveProducts, listStationOptions } from "./catalogue.server";
import type { ReportDetail } from "./event-read.server";
import { foamSystemFactsMap } from "./foam-system-facts.server";

/** The choices the usage-report form offers. */
export async function reportFormOptions() {
  const [stations, apparatus, products, { timeZone }] = await Promise.all([
    listStationOptions(),
    listActiveApparatus(),
    listActiveProducts(),
    readAgencySettings(),
  ]);
  const systems = [
    ...(
      await foamSystemFactsMap(
        db,
        apparatus.map((unit) => unit.id),
      )
    ).values(),
  ].filter((system) => system.active);
  return {
    timeZone,
    stations: stations.filter((station) => station.active),
    apparatus: apparatus.map(({ id, unitId, description, compressedAirCfm, outlets }) => ({
      id,
      unitId,
      description,
      compressedAirCfm,
      outlets,
      foamSystems: systems
        .filter((system) => system.apparatusId === id)
        .map((system) => ({
          id: system.id,
          name: system.name,
          percentOf: system.percentOf,
          outlets: system.outlets,
          outOfTolerance: system.outOfTolerance.some((span) => span.to == null),
        })),
    })),
    products: products.map(({ id, name, foamClass, nominalPercents, pfasContaining, heldForDisposal }) => ({
      id,
      name,
      foamClass,
      nominalPercents,
      pfasContaining,
      heldForDisposal,
    })),
  };
}

const text = (value: number | string | null | undefined) => (value == null ? undefined : String(value));

/** A saved report as the form's typed values. */
export function formValuesOf(report: NonNullable<ReportDetail>): Record<string, unknown> {
  return {
    number: report.number,
    kind: report.kind,
    incidentType: report.incidentType ?? undefined,
    dispatchNumber: report.dispatchNumber ?? undefined,
    startedAt: report.startedAt || undefined,
    clearedAt: report.clearedAt || undefined,
    address: report.address,
    latitude: text(report.latitude),
    longitude: text(report.longitude),
    stationId: text(report.stationId),
    narrative: report.narrative,
    discharges: report.discharges.map((line) => ({
      apparatusId: text(line.apparatusId),
      outlet: line.outlet,
      productId: text(line.productId),
      percent: text(line.percent),
      flow: text(line.flow),
      flowUnit: line.flowUnit,
      basis: line.basis,
      percentOf: line.productId ? line.percentOf : undefined,
      startedAt: line.startedAt || undefined,
      endedAt: line.endedAt || undefined,
      minutes: line.startedAt && line.endedAt ? undefined : text(line.minutes),
      method: line.method ?? undefined,
      airFlowCfm: text(line.airFlowCfm),
      mutualAidAgency: line.mutualAidAgency ?? undefined,
      mutualAidUnit: line.mutualAidUnit ?? undefined,
      heldUseReason: line.heldUseReason ?? undefined,
    })),
    dispositions: report.dispositions.map((line) => ({
      disposition: line.disposition,
      sharePercent: text(line.sharePercent),
      volumeGal: text(line.volumeGal),
      receivingWater: line.receivingWater,
      disposalReference: line.disposalReference,
      sewerNotice: line.sewerNotice,
    })),
    tankReadings: report.tankReadings.map((line) => ({
      apparatusId: text(line.apparatusId),
      productId: text(line.productId),
      refillGal: text(line.refillGal),
      levelBeforeGal: text(line.levelBeforeGal),
      levelAfterGal: text(line.levelAfterGal),
    })),
  };
}
