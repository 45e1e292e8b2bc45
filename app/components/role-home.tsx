import { Link } from "react-router";
import { type Capability, ROLE_LABELS, type Role, rolesCan } from "~/lib/access";

type Task = { label: string; capability: Capability; to?: string; note?: string };

/**
 * The tasks a home page offers, in order. Each role's card lists those the access table gives that
 * role; items without a link are not built yet and say so.
 */
export const HOME_TASKS: Task[] = [
  { label: "File a foam-usage report for your crew's event", capability: "report.create", to: "/events/new" },
  { label: "Review filed reports", capability: "report.review", to: "/review" },
  { label: "Events and their usage reports", capability: "report.read", to: "/events" },
  { label: "Usage across the district on the map", capability: "usage.map", to: "/map" },
  { label: "Quarterly runoff and PFAS summaries", capability: "exports.quarterly", to: "/environmental" },
  { label: "Foam products: PFAS content and safety sheets", capability: "catalogue.read", to: "/products" },
  { label: "Drainage basins, waterways and storm inlets", capability: "geography.edit", to: "/geography" },
  { label: "People and roles", capability: "users.manage", to: "/admin/users" },
  {
    label: "Agency settings: buffers, thresholds and mail recipients",
    capability: "settings.read",
    to: "/admin/settings",
  },
  { label: "Apparatus, foam systems and stations", capability: "apparatus.edit", to: "/apparatus" },
  { label: "Public-records requests: the queue and due dates", capability: "records.manage", to: "/records" },
];

export function tasksFor(role: Role): Task[] {
  return HOME_TASKS.filter((task) => rolesCan([role], task.capability));
}

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
            {tasksFor(role).map((task) => (
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
