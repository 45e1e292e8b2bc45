import { describe, expect, it } from "vitest";
import {
  DEFAULT_INCIDENT_TYPE,
  dischargeUnitLabel,
  EVENT_KIND_LABELS,
  EVENT_KINDS,
  foamClassAndTypeLabel,
  INCIDENT_TYPE_LABELS,
  INCIDENT_TYPES,
  INCIDENT_TYPES_BY_KIND,
  incidentTypeLabel,
} from "./vocabulary";

describe("the words of the incident record", () => {
  it("gives every kind types from the list, its own default among them, and one label for the kind's own word", () => {
    for (const kind of EVENT_KINDS) {
      for (const type of INCIDENT_TYPES_BY_KIND[kind]) expect(INCIDENT_TYPES).toContain(type);
      const own = DEFAULT_INCIDENT_TYPE[kind];
      if (own) {
        expect(INCIDENT_TYPES_BY_KIND[kind]).toContain(own);
        expect(INCIDENT_TYPE_LABELS[own]).toBe(EVENT_KIND_LABELS[kind]);
      }
    }
    expect(DEFAULT_INCIDENT_TYPE.incident).toBeNull();
    expect(incidentTypeLabel(null)).toBe("Not recorded");
    expect(incidentTypeLabel("flammable_liquid_spill")).toBe("Flammable-liquid spill");
  });

  it("names a mutual-aid unit by its agency and id, our own by its id", () => {
    expect(dischargeUnitLabel({ apparatus: "E2" })).toBe("E2");
    expect(
      dischargeUnitLabel({ apparatus: null, mutualAidAgency: "Cedar Ford FPD (test)", mutualAidUnit: "BR61" }),
    ).toBe("Mutual aid: Cedar Ford FPD (test) BR61");
  });

  it("does not repeat a product's class as its type", () => {
    expect(foamClassAndTypeLabel("A", "class-a")).toBe("Class A");
    expect(foamClassAndTypeLabel("B", "ar-afff")).toBe("Class B · AR-AFFF (alcohol-resistant)");
  });
});
