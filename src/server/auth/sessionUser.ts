// The signed-in person as pages, endpoints and services see them.
import type { Role } from "@/features/people/people";

export interface SessionUser {
  id: string;
  email: string;
  name: string;
  role: Role;
}
