// Who may do what: the one table of access rules for pages and API routes (api.md's role matrix).
// The middleware applies the first rule whose method and path match; nothing else checks roles.
import type { Role } from "@/features/people/people";

export type Access = "public" | "signed-in" | readonly Role[];

export interface Rule {
  /** HTTP methods the rule covers; omitted means every method. */
  methods?: readonly string[];
  path: RegExp;
  access: Access;
  /** Whether an API token (`Authorization: Bearer`) may authenticate this request. */
  token?: boolean;
}

const EVERYONE: readonly Role[] = ["admin", "designer", "firmware", "reviewer"];
const AUTHORS: readonly Role[] = ["admin", "designer"];
const DECIDERS: readonly Role[] = ["admin", "reviewer"];
const ADMIN: readonly Role[] = ["admin"];
const READ = ["GET", "HEAD"] as const;
const WRITE = ["POST", "PUT", "PATCH", "DELETE"] as const;

export const rules: readonly Rule[] = [
  // Open to everyone: health, the auth library's own routes, sign-in, accepting an invitation, assets.
  { path: /^\/api\/v1\/health\/?$/, access: "public" },
  { path: /^\/api\/auth\//, access: "public" },
  { path: /^\/sign-in\/?$/, access: "public" },
  { path: /^\/invite\/[^/]+\/?$/, access: "public" },
  { path: /^\/api\/v1\/invitations\/[^/]+\/accept\/?$/, access: "public" },
  // Whole path segments only: /_astro/… and /fonts/…, and the icon itself (not /fontsecret or /favicon-admin).
  { path: /^\/(_astro|fonts)\/|^\/favicon\.svg$/, access: "public" },

  // Admin: people, roles, invitations, the audit trail, the dev mailbox.
  { path: /^\/api\/v1\/(users|invitations|audit|queue)(\/|$)/, access: ADMIN },
  { path: /^\/api\/v1\/dev\/mail\/?$/, access: ADMIN },
  { path: /^\/admin(\/|$)/, access: ADMIN },

  // Everyone: their own API tokens, and exporting tap tables (also with a token).
  { path: /^\/api\/v1\/tokens(\/|$)/, access: EVERYONE },
  { methods: READ, path: /^\/api\/v1\/tap-tables\/[^/]+\/versions\/[^/]+\/export\/?$/, access: EVERYONE, token: true },

  // Sign-off: designers request, reviewers decide.
  { methods: ["POST"], path: /^\/api\/v1\/tap-tables\/[^/]+\/versions\/[^/]+\/sign-off\/?$/, access: AUTHORS },
  { methods: ["POST"], path: /^\/api\/v1\/sign-offs\/[^/]+\/decision\/?$/, access: DECIDERS },
  { methods: ["POST"], path: /^\/api\/v1\/sign-offs\/[^/]+\/comments\/?$/, access: EVERYONE },

  // The work itself: everyone reads (also with a token), designers and admins write.
  {
    methods: READ,
    path: /^\/api\/v1\/(channels|budgets|runs|studies|tap-tables|sweeps|sign-offs)(\/|$)/,
    access: EVERYONE,
    token: true,
  },
  { methods: WRITE, path: /^\/api\/v1\/(channels|budgets|runs|studies|tap-tables|sweeps)(\/|$)/, access: AUTHORS },

  // Everything else (the pages and /api/v1/me) needs a signed-in person of any role.
  { methods: READ, path: /^\/api\/v1\/me\/?$/, access: "signed-in", token: true },
  { path: /^\/api\//, access: ADMIN },
  { path: /^\//, access: "signed-in" },
];

/** The first rule that covers a request. The last rule covers every path, so this always answers. */
export function ruleFor(method: string, pathname: string): Rule {
  const m = method.toUpperCase();
  const rule = rules.find((r) => (!r.methods || r.methods.includes(m)) && r.path.test(pathname));
  if (!rule) throw new Error(`no access rule covers ${m} ${pathname}`);
  return rule;
}

/** Whether a signed-in person with this role may pass the rule. */
export function allows(rule: Rule, role: Role): boolean {
  if (rule.access === "public" || rule.access === "signed-in") return true;
  return rule.access.includes(role);
}

/** Whether a role may use a page section; the shell uses this to show only what a person may open. */
export function canWrite(role: Role): boolean {
  return AUTHORS.includes(role);
}
export function canDecide(role: Role): boolean {
  return DECIDERS.includes(role);
}
