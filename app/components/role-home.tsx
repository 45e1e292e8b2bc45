import { Link } from "react-router";
import { ROLE_LABELS, type Role } from "~/lib/roles";

type Task = { label: string; to?: string; note?: string };

/** What each role gets done from its home page. Items without a link are not built yet and say so. */
export const ROLE_TASKS: Record<Role, Task[]> = {
  officer: [
    { label: "File a foam-usage report for your crew's event", to: "/events/new" },
    { label: "Events and reports", to: "/events" },
  ],
  environmental: [
    { label: "Review filed reports", to: "/events?status=filed" },
    { label: "Quarterly runoff and PFAS summaries", to: "/environmental" },
    { label: "Foam products: PFAS content and safety sheets", to: "/products" },
    { label: "Drainage basins, waterways and storm inlets", to: "/geography" },
    { label: "Usage on the map", to: "/map" },
  ],
  chief: [
    { label: "Usage across the district on the map", to: "/map" },
    { label: "Quarterly runoff and PFAS summaries", to: "/environmental" },
    { label: "Reports waiting for review", to: "/events?status=filed" },
    { label: "People and roles", to: "/admin/users" },
    { label: "Agency settings (read only)", to: "/admin/settings" },
    { label: "Apparatus, foam systems and stations", to: "/apparatus" },
    { label: "Foam products", to: "/products" },
  ],
  records: [
    { label: "Events and their usage reports", to: "/events" },
    { label: "Public-records requests", note: "Records requests are planned and not yet available." },
  ],
  admin: [
    { label: "People and roles", to: "/admin/users" },
    { label: "Agency settings: buffers, thresholds and mail recipients", to: "/admin/settings" },
    { label: "Apparatus and stations", to: "/apparatus" },
  ],
};

export function RoleHome({ roles }: { roles: Role[] }) {
  if (roles.length === 0) {
    return <p className="card">Your account has no roles yet. Ask an administrator to give you one.</p>;
  }
  return (
    <div className="grid gap-4 md:grid-cols-2">
      {roles.map((role) => (
        <section key={role} className="card" aria-labelledby={`home-${role}`}>
          <h2 id={`home-${role}`} className="text-lg font-semibold">
            {ROLE_LABELS[role]}
          </h2>
          <ul className="mt-3 space-y-2">
            {ROLE_TASKS[role].map((task) => (
              <li key={task.label}>
                {task.to ? (
                  <Link to={task.to} className="font-medium text-pond-700 underline underline-offset-4">
                    {task.label}
                  </Link>
                ) : (
                  <span>
                    {task.label}
                    {task.note ? <span className="block text-sm text-slate-ft">{task.note}</span> : null}
                  </span>
                )}
              </li>
            ))}
          </ul>
        </section>
      ))}
    </div>
  );
}
