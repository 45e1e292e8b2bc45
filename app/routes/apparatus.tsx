import { Link } from "react-router";
import type { Route } from "./+types/apparatus";
import { requireCapability } from "~/lib/access.server";
import { listApparatus, listStations } from "~/models/apparatus.server";

export const meta: Route.MetaFunction = () => [{ title: "Apparatus and stations · Foamtally" }];

export async function loader({ request }: Route.LoaderArgs) {
  await requireCapability(request, "apparatus.edit");
  const [stations, apparatus] = await Promise.all([listStations(), listApparatus()]);
  return { stations, apparatus };
}

const dash = (value: number | null, unit = "") => (value == null ? "—" : `${value}${unit}`);

export default function ApparatusAndStations({ loaderData }: Route.ComponentProps) {
  const { stations, apparatus } = loaderData;
  return (
    <div className="space-y-6">
      <h1 className="text-2xl font-bold">Apparatus and stations</h1>
      <section className="card overflow-x-auto" aria-labelledby="apparatus-title">
        <div className="flex flex-wrap items-center justify-between gap-3">
          <h2 id="apparatus-title" className="text-lg font-semibold">
            Apparatus and their foam systems
          </h2>
          <Link to="/apparatus/new" className="btn-primary">
            Add apparatus
          </Link>
        </div>
        <table className="data-table mt-3">
          <thead>
            <tr>
              <th scope="col">Unit</th>
              <th scope="col">Station</th>
              <th scope="col">Concentrate tank</th>
              <th scope="col">Proportioner max</th>
              <th scope="col">Water flow range</th>
              <th scope="col">Compressed air</th>
              <th scope="col">Outlets</th>
              <th scope="col">Status</th>
            </tr>
          </thead>
          <tbody>
            {apparatus.map((unit) => (
              <tr key={unit.id}>
                <td>
                  <Link to={`/apparatus/${unit.id}`} className="font-medium text-pond-700 underline">
                    {unit.unitId}
                  </Link>
                  <span className="block text-xs text-slate-ft">{unit.description}</span>
                </td>
                <td>{unit.stationCode ?? "—"}</td>
                <td>{dash(unit.concentrateTankGal, " gal")}</td>
                <td>{dash(unit.proportionerMaxConcentrateGpm, " gpm concentrate")}</td>
                <td>
                  {unit.waterFlowMinGpm == null && unit.waterFlowMaxGpm == null
                    ? "—"
                    : `${unit.waterFlowMinGpm ?? "?"}–${unit.waterFlowMaxGpm ?? "?"} gpm`}
                </td>
                <td>{dash(unit.compressedAirCfm, " cfm")}</td>
                <td>
                  {unit.outlets.map((outlet) => outlet.name + (outlet.foamCapable ? "" : " (water only)")).join(", ") ||
                    "—"}
                </td>
                <td>{unit.active ? "In service" : "Out of service"}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </section>
      <section className="card overflow-x-auto" aria-labelledby="stations-title">
        <div className="flex flex-wrap items-center justify-between gap-3">
          <h2 id="stations-title" className="text-lg font-semibold">
            Stations
          </h2>
          <Link to="/stations/new" className="btn-secondary">
            Add a station
          </Link>
        </div>
        <table className="data-table mt-3">
          <thead>
            <tr>
              <th scope="col">Code</th>
              <th scope="col">Name</th>
              <th scope="col">Address</th>
              <th scope="col">Location</th>
              <th scope="col">Status</th>
            </tr>
          </thead>
          <tbody>
            {stations.map((station) => (
              <tr key={station.id}>
                <td>
                  <Link to={`/stations/${station.id}`} className="font-medium text-pond-700 underline">
                    {station.code}
                  </Link>
                </td>
                <td>{station.name}</td>
                <td>{station.address || "—"}</td>
                <td>
                  {station.latitude != null && station.longitude != null
                    ? `${station.latitude.toFixed(4)}, ${station.longitude.toFixed(4)}`
                    : "—"}
                </td>
                <td>{station.active ? "Open" : "Closed"}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </section>
    </div>
  );
}
