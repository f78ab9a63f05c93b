// People's roles, and the request schemas for people, roles and invitations (shared by the API,
// the admin page and the database schema).
import { z } from "zod";

/** The four roles of Tapwright; the rules of what each may do live in src/server/auth/rules.ts. */
export const roles = ["admin", "designer", "firmware", "reviewer"] as const;
export type Role = (typeof roles)[number];

export const roleSchema = z.enum(roles, { message: `Role must be one of ${roles.join(", ")}.` });

export const inviteRequest = z.object({
  email: z
    .email({ message: "Give a valid e-mail address." })
    .max(254)
    .transform((s) => s.toLowerCase()),
  role: roleSchema,
});

export const setRoleRequest = z.object({ role: roleSchema });

/** PUT /api/v1/users/:id/active: false deactivates (sessions and tokens end), true lets the person back in. */
export const setActiveRequest = z.object({ active: z.boolean({ error: "Give active: true or false." }) });

export const acceptInvitationRequest = z.object({
  name: z.string().trim().min(1, "Give your name.").max(200),
  password: z.string().min(10, "Use at least 10 characters.").max(128, "Use at most 128 characters."),
});

export const roleLabels: Record<Role, string> = {
  admin: "Admin",
  designer: "Designer",
  firmware: "Firmware",
  reviewer: "Reviewer",
};
