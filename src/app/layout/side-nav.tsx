// The area navigation: a column on wide screens, a wrapped row on narrow ones.
import { NavLink } from "react-router-dom";
import type { Role } from "../../../shared/roles";
import { navFor } from "./nav-items";

export function SideNav({ roles }: { roles: readonly Role[] }) {
  const groups = navFor(roles);
  return (
    <nav aria-label="Main" className="border-b border-slate-200 bg-paper-200 px-4 py-3 md:w-56 md:shrink-0 md:border-r md:border-b-0 md:px-3 md:py-6">
      <div className="flex flex-wrap gap-x-6 gap-y-2 md:flex-col md:gap-5">
        {groups.map((group, i) => (
          <div key={group.label ?? i}>
            {group.label ? (
              <h2 id={`nav-${group.label}`} className="px-2 pb-1 text-xs font-semibold uppercase tracking-wide text-slate-600">
                {group.label}
              </h2>
            ) : null}
            <ul aria-labelledby={group.label ? `nav-${group.label}` : undefined} className="flex flex-wrap gap-1 md:flex-col">
              {group.items.map((item) => (
                <li key={item.to}>
                  <NavLink
                    to={item.to}
                    end={item.end}
                    className={({ isActive }) =>
                      "block rounded-md px-2 py-1.5 text-sm " +
                      (isActive
                        ? "bg-white font-semibold text-ink-950 shadow-sm ring-1 ring-slate-200"
                        : "text-slate-700 hover:bg-paper-300 hover:text-ink-950")
                    }
                  >
                    {item.label}
                  </NavLink>
                </li>
              ))}
            </ul>
          </div>
        ))}
      </div>
    </nav>
  );
}
