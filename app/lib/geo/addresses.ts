import type { FeatureCollection } from "geojson";

export type AddressMatch = { address: string; latitude: number; longitude: number };

const normalise = (text: string) =>
  text
    .toLowerCase()
    .replace(/[^a-z0-9 ]+/g, " ")
    .replace(/\s+/g, " ")
    .trim();

// Common street-type abbreviations a person types, and the words the address points use.
const SYNONYMS: Record<string, string> = { st: "street", ave: "avenue", av: "avenue", rd: "road", ln: "lane" };

/**
 * Address points whose text holds every word typed (each as a word prefix), best first: an exact
 * house number before a partial one, then alphabetical. Local data only; no hosted geocoder.
 */
export function searchAddresses(points: FeatureCollection | null, query: string, limit = 8): AddressMatch[] {
  const words = normalise(query)
    .split(" ")
    .filter(Boolean)
    .map((word) => SYNONYMS[word] ?? word);
  if (!points || words.length === 0) return [];
  const matches: (AddressMatch & { rank: number })[] = [];
  for (const feature of points.features) {
    if (feature.geometry?.type !== "Point") continue;
    const address = String(feature.properties?.address ?? feature.properties?.ADDRESS ?? "");
    const haystack = normalise(address).split(" ");
    if (!words.every((word) => haystack.some((part) => part.startsWith(word)))) continue;
    const [longitude, latitude] = feature.geometry.coordinates;
    const rank = words.every((word) => haystack.includes(word)) ? 0 : 1;
    matches.push({ address, latitude, longitude, rank });
  }
  matches.sort((a, b) => a.rank - b.rank || a.address.localeCompare(b.address, "en", { numeric: true }));
  return matches.slice(0, limit).map(({ address, latitude, longitude }) => ({ address, latitude, longitude }));
}
