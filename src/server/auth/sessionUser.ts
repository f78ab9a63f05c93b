// The signed-in person as pages, endpoints and services see them.
import type { Role } from "@/db/schema/auth";

export interface SessionUser {
  id: string;
  email: string;
  name: string;
  role: Role;
}
