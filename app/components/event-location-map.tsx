import type { Map as MapLibreMap, Marker } from "maplibre-gl";
import { useEffect, useId, useRef, useState } from "react";
import type { AddressMatch } from "~/lib/geo/addresses";
import type { LocationCheck } from "~/lib/geo/checks";
import { isValidLatLon } from "~/lib/geo/coordinates";
import { basemapStyle, DISTRICT_CENTER } from "~/lib/geo/map-style";
import { loadMapLibre } from "./maplibre-loader";

export type DischargePoint = { key: string; label: string; latitude: number | null; longitude: number | null };

type Props = {
  /** Starting point (strings as they come from a form, or numbers); empty when not placed yet. */
  defaultLatitude?: string | number | null;
  defaultLongitude?: string | number | null;
  /** Names of the two inputs inside the surrounding form (default "latitude" and "longitude"). */
  latitudeName?: string;
  longitudeName?: string;
  /** Errors from the server for either field (shown at the field). */
  latitudeErrors?: string[];
  longitudeErrors?: string[];
  /**
   * Name of the form's address input: picking a search result writes the address there too
   * (an input event is sent, so form libraries see the change).
   */
  addressInputName?: string;
  /** Called when the point changes; `address` is set when it was picked from the address search. */
  onChange?: (point: { latitude: number; longitude: number; address?: string }) => void;
  /**
   * Discharge points to show and place with the event (the form keeps their values); each gets
   * its own draggable marker, and a choice of what a click on the map places.
   */
  dischargePoints?: DischargePoint[];
  onDischargePointChange?: (key: string, point: { latitude: number; longitude: number }) => void;
  /**
   * A point to place the event at, as if clicked (a new object each time it is asked for, e.g. a
   * photo's recorded position): it fills the two inputs, which the form then saves as typed.
   */
  placeAt?: { latitude: number; longitude: number } | null;
  disabled?: boolean;
};

const toText = (value: string | number | null | undefined) => (value == null ? "" : String(value));
const metres = (value: number | null) =>
  value == null
    ? "not known"
    : `${Math.round(value).toLocaleString("en-US")} m (${Math.round(value * 3.28084).toLocaleString("en-US")} ft)`;

/**
 * Where the event happened: click or drag the marker, type latitude/longitude, or search the
 * district's own address points. Shows the server's geography checks as soon as the point is set.
 */
export function EventLocationMap({
  defaultLatitude,
  defaultLongitude,
  latitudeName = "latitude",
  longitudeName = "longitude",
  latitudeErrors,
  longitudeErrors,
  addressInputName,
  onChange,
  dischargePoints,
  onDischargePointChange,
  placeAt,
  disabled = false,
}: Props) {
  const id = useId();
  const container = useRef<HTMLDivElement>(null);
  const mapRef = useRef<MapLibreMap | null>(null);
  const markerRef = useRef<Marker | null>(null);
  const [latitude, setLatitude] = useState(toText(defaultLatitude));
  const [longitude, setLongitude] = useState(toText(defaultLongitude));
  const [checks, setChecks] = useState<LocationCheck | null>(null);
  const [checkState, setCheckState] = useState<"idle" | "loading" | "failed">("idle");
  const [mapState, setMapState] = useState<"loading" | "ready" | "failed">("loading");
  const [query, setQuery] = useState("");
  const [matches, setMatches] = useState<AddressMatch[] | null>(null);
  const onChangeRef = useRef(onChange);
  onChangeRef.current = onChange;
  const placeRef = useRef<(lat: number, lon: number, address?: string) => void>(() => {});
  const [target, setTarget] = useState<string>("event");
  const targetRef = useRef(target);
  targetRef.current = target;
  const pointChangeRef = useRef(onDischargePointChange);
  pointChangeRef.current = onDischargePointChange;
  const pointMarkers = useRef(new Map<string, Marker>());
  const maplibreRef = useRef<Awaited<ReturnType<typeof loadMapLibre>> | null>(null);

  const lat = Number(latitude);
  const lon = Number(longitude);
  const valid = latitude.trim() !== "" && longitude.trim() !== "" && isValidLatLon(lat, lon);

  placeRef.current = (newLat, newLon, address) => {
    const rounded = (n: number) => String(Math.round(n * 1e6) / 1e6);
    setLatitude(rounded(newLat));
    setLongitude(rounded(newLon));
    onChangeRef.current?.({ latitude: Number(rounded(newLat)), longitude: Number(rounded(newLon)), address });
  };

  useEffect(() => {
    let cancelled = false;
    let map: MapLibreMap | undefined;
    const markers = pointMarkers.current;
    loadMapLibre()
      .then((maplibre) => {
        if (cancelled || !container.current) return;
        maplibreRef.current = maplibre;
        const startLat = Number(defaultLatitude);
        const startLon = Number(defaultLongitude);
        const placed = defaultLatitude != null && defaultLatitude !== "" && isValidLatLon(startLat, startLon);
        map = new maplibre.Map({
          container: container.current,
          style: basemapStyle(window.location.origin),
          center: placed ? [startLon, startLat] : DISTRICT_CENTER,
          zoom: placed ? 15 : 12,
          maxZoom: 18,
          attributionControl: { compact: true },
        });
        mapRef.current = map;
        map.addControl(new maplibre.NavigationControl({ showCompass: false }), "top-right");
        const marker = new maplibre.Marker({ draggable: !disabled, color: "#8f3d12" });
        markerRef.current = marker;
        if (placed) marker.setLngLat([startLon, startLat]).addTo(map);
        marker.on("dragend", () => {
          const point = marker.getLngLat();
          placeRef.current(point.lat, point.lng);
        });
        if (!disabled) {
          map.on("click", (event) => {
            if (targetRef.current === "event") placeRef.current(event.lngLat.lat, event.lngLat.lng);
            else
              pointChangeRef.current?.(targetRef.current, { latitude: event.lngLat.lat, longitude: event.lngLat.lng });
          });
        }
        map.on("load", () => !cancelled && setMapState("ready"));
        map.on("error", (event) => console.warn("map:", event.error?.message));
      })
      .catch(() => !cancelled && setMapState("failed"));
    return () => {
      cancelled = true;
      map?.remove();
      mapRef.current = null;
      markerRef.current = null;
      markers.clear();
    };
    // The map is created once; later changes to the point move the marker below.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, []);

  useEffect(() => {
    if (placeAt && isValidLatLon(placeAt.latitude, placeAt.longitude))
      placeRef.current(placeAt.latitude, placeAt.longitude);
  }, [placeAt]);

  // Keep the marker where the inputs say, and ask the server for the checks.
  useEffect(() => {
    const map = mapRef.current;
    const marker = markerRef.current;
    if (!valid) {
      setChecks(null);
      return;
    }
    if (map && marker) {
      marker.setLngLat([lon, lat]);
      if (!marker.getElement().isConnected) marker.addTo(map);
      if (!map.getBounds().contains([lon, lat])) map.easeTo({ center: [lon, lat] });
    }
    const controller = new AbortController();
    const timer = setTimeout(() => {
      setCheckState("loading");
      // Fixed decimals (as stored, about 0.1 m): the API reads decimal degrees, never an exponent.
      fetch(`/api/geo/check?lat=${lat.toFixed(6)}&lon=${lon.toFixed(6)}`, {
        signal: controller.signal,
        headers: { Accept: "application/json" },
      })
        .then(async (response) => {
          if (!response.ok) throw new Error(String(response.status));
          setChecks((await response.json()) as LocationCheck);
          setCheckState("idle");
        })
        .catch((error: unknown) => {
          if ((error as Error).name !== "AbortError") setCheckState("failed");
        });
    }, 250);
    return () => {
      clearTimeout(timer);
      controller.abort();
    };
  }, [lat, lon, valid, mapState]);

  // One small numbered marker per discharge point that has coordinates.
  useEffect(() => {
    const map = mapRef.current;
    const maplibre = maplibreRef.current;
    if (!map || !maplibre) return;
    const wanted = new Set<string>();
    (dischargePoints ?? []).forEach((point, index) => {
      if (point.latitude == null || point.longitude == null || !isValidLatLon(point.latitude, point.longitude)) return;
      wanted.add(point.key);
      let marker = pointMarkers.current.get(point.key);
      if (!marker) {
        const element = document.createElement("div");
        element.className =
          "flex h-6 w-6 items-center justify-center rounded-full border-2 border-white bg-pond-700 text-xs font-bold text-white shadow";
        element.textContent = String(index + 1);
        element.title = point.label;
        marker = new maplibre.Marker({ element, draggable: !disabled });
        marker.on("dragend", () => {
          const at = marker!.getLngLat();
          pointChangeRef.current?.(point.key, { latitude: at.lat, longitude: at.lng });
        });
        pointMarkers.current.set(point.key, marker);
        marker.setLngLat([point.longitude, point.latitude]).addTo(map);
      } else {
        marker.setLngLat([point.longitude, point.latitude]);
      }
    });
    for (const [key, marker] of pointMarkers.current) {
      if (!wanted.has(key)) {
        marker.remove();
        pointMarkers.current.delete(key);
      }
    }
  }, [dischargePoints, mapState, disabled]);

  async function search() {
    const text = query.trim();
    if (!text) return;
    try {
      const response = await fetch(`/api/geo/addresses?q=${encodeURIComponent(text)}`, {
        headers: { Accept: "application/json" },
      });
      if (!response.ok) throw new Error(String(response.status));
      setMatches(((await response.json()) as { matches: AddressMatch[] }).matches);
    } catch {
      setMatches([]);
    }
  }

  function choose(match: AddressMatch) {
    placeRef.current(match.latitude, match.longitude, match.address);
    const field = addressInputName ? container.current?.closest("form")?.elements.namedItem(addressInputName) : null;
    if (field instanceof HTMLInputElement || field instanceof HTMLTextAreaElement) {
      const setter = Object.getOwnPropertyDescriptor(Object.getPrototypeOf(field), "value")?.set;
      setter?.call(field, match.address);
      field.dispatchEvent(new Event("input", { bubbles: true }));
    }
    setMatches(null);
    setQuery(match.address);
    mapRef.current?.easeTo({ center: [match.longitude, match.latitude], zoom: 16 });
  }

  return (
    <fieldset className="space-y-3" aria-describedby={`${id}-help`} disabled={disabled}>
      <legend className="field-label">Location</legend>
      <p id={`${id}-help`} className="text-sm text-slate-ft">
        Click the map or drag the marker, type the latitude and longitude, or search an address in the district.
      </p>
      <div className="flex flex-wrap items-end gap-2">
        <label className="min-w-0 flex-1">
          <span className="field-label">Search an address</span>
          <input
            type="search"
            className="field-input"
            value={query}
            onChange={(event) => setQuery(event.target.value)}
            onKeyDown={(event) => {
              if (event.key === "Enter") {
                event.preventDefault();
                void search();
              }
            }}
            placeholder="e.g. 105 Main Street"
            autoComplete="off"
          />
        </label>
        <button type="button" className="btn-secondary" onClick={() => void search()}>
          Find
        </button>
      </div>
      {matches ? (
        matches.length === 0 ? (
          <p className="text-sm text-slate-ft" role="status">
            No address in the district matches. Place the point on the map instead.
          </p>
        ) : (
          <ul className="divide-y divide-stone-200 rounded-md border border-stone-200" aria-label="Matching addresses">
            {matches.map((match) => (
              <li key={`${match.address}-${match.latitude}`}>
                <button type="button" className="btn-quiet w-full justify-start" onClick={() => choose(match)}>
                  {match.address}
                </button>
              </li>
            ))}
          </ul>
        )
      ) : null}
      <div className="relative h-80 overflow-hidden rounded-lg border border-stone-300">
        <div
          ref={container}
          className="h-full w-full"
          role="region"
          aria-label="Event location map"
          data-testid="event-location-map"
          data-state={mapState}
        />
        {mapState === "failed" ? (
          <p className="caution absolute inset-x-2 top-2">The map cannot start here; type the coordinates instead.</p>
        ) : null}
      </div>
      {dischargePoints?.length ? (
        <fieldset className="flex flex-wrap gap-x-4 text-sm">
          <legend className="field-label">A click on the map places</legend>
          {[{ key: "event", label: "the event" }, ...dischargePoints].map((option) => (
            <label key={option.key} className="flex min-h-11 items-center gap-2">
              <input
                type="radio"
                name={`${id}-target`}
                className="h-5 w-5"
                checked={target === option.key}
                onChange={() => setTarget(option.key)}
              />
              {option.label}
            </label>
          ))}
        </fieldset>
      ) : null}
      <div className="grid grid-cols-2 gap-3">
        <label>
          <span className="field-label">Latitude (°N)</span>
          <input
            name={latitudeName}
            inputMode="decimal"
            className="field-input"
            value={latitude}
            onChange={(event) => setLatitude(event.target.value)}
            onBlur={() => valid && onChangeRef.current?.({ latitude: lat, longitude: lon })}
            aria-invalid={latitudeErrors?.length ? true : undefined}
            aria-describedby={latitudeErrors?.length ? `${id}-lat-errors` : undefined}
          />
          {latitudeErrors?.length ? (
            <span id={`${id}-lat-errors`} className="field-error block">
              {latitudeErrors.join(" ")}
            </span>
          ) : null}
        </label>
        <label>
          <span className="field-label">Longitude (°E, negative for west)</span>
          <input
            name={longitudeName}
            inputMode="decimal"
            className="field-input"
            value={longitude}
            onChange={(event) => setLongitude(event.target.value)}
            onBlur={() => valid && onChangeRef.current?.({ latitude: lat, longitude: lon })}
            aria-invalid={longitudeErrors?.length ? true : undefined}
            aria-describedby={longitudeErrors?.length ? `${id}-lon-errors` : undefined}
          />
          {longitudeErrors?.length ? (
            <span id={`${id}-lon-errors`} className="field-error block">
              {longitudeErrors.join(" ")}
            </span>
          ) : null}
        </label>
      </div>
      <LocationCheckPanel checks={valid ? checks : null} state={checkState} placed={valid} />
    </fieldset>
  );
}

/** The server's checks for the point, with the cautions where the officer decides. */
export function LocationCheckPanel({
  checks,
  state,
  placed,
}: {
  checks: LocationCheck | null;
  state: "idle" | "loading" | "failed";
  placed: boolean;
}) {
  if (!placed)
    return <p className="text-sm text-slate-ft">Place the event to see its drainage basin and nearby water.</p>;
  if (state === "failed") {
    return (
      <p className="caution" role="status">
        The geography checks could not be fetched just now. They are computed again when the report is saved.
      </p>
    );
  }
  if (!checks) return <p className="text-sm text-slate-ft">Checking the location…</p>;
  return (
    <div className="space-y-2" aria-live="polite" data-testid="location-checks">
      <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
        <dt className="text-slate-ft">Drainage basin</dt>
        <dd className="font-semibold">{checks.drainageBasin ?? "not in any basin on file"}</dd>
        <dt className="text-slate-ft">Nearest waterway</dt>
        <dd>
          {checks.nearestWaterway ? `${checks.nearestWaterway}, ${metres(checks.nearestWaterwayM)}` : "not known"}
        </dd>
        <dt className="text-slate-ft">Nearest storm inlet</dt>
        <dd>{checks.nearestInlet ? `${checks.nearestInlet}, ${metres(checks.nearestInletM)}` : "not known"}</dd>
        <dt className="text-slate-ft">Jurisdiction</dt>
        <dd>
          {checks.outsideJurisdiction == null
            ? "not known"
            : checks.outsideJurisdiction
              ? "outside the district"
              : "inside the district"}
        </dd>
      </dl>
      {checks.withinWaterwayBuffer ? (
        <p className="caution" role="status">
          Within {Math.round(checks.waterwayBufferM)} m of {checks.nearestWaterway}. Keep foam and runoff out of the
          water: contain and collect where you can. Class A surfactants harm aquatic life, and a PFAS-containing foam
          release at or above a reportable quantity must be reported immediately (CERCLA §103, EPCRA §304); this record
          is not a notification. Local rules, permits and licensed practice govern.
        </p>
      ) : null}
      {checks.nearestInletM != null && checks.nearestInletM < 50 ? (
        <p className="caution">
          A storm inlet is close by: block or cover it, so runoff does not reach the storm drains.
        </p>
      ) : null}
      {checks.outsideJurisdiction ? (
        <p className="caution">
          This point is outside the district boundary. Check the coordinates, or note the mutual aid.
        </p>
      ) : null}
      {checks.layersMissing.length ? (
        <p className="text-sm text-slate-ft">Some layers are not loaded yet, so those checks show “not known”.</p>
      ) : null}
    </div>
  );
}
