import type { Person } from "../../models";
import type { Role } from "@/lib/auth/roles";

// How a person is shown in lists: no password hash, no session version.

export interface PersonSummary {
  id: string;
  name: string;
  email: string;
  roles: Role[];
  active: boolean;
}

export function summary(p: Person): PersonSummary {
  return { id: p.id, name: p.name, email: p.email, roles: p.roles, active: p.active };
}
