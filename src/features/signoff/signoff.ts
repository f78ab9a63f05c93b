// Sign-off of a tap table version: request schemas, the shapes the API answers, and the comment
// thread as a tree. No server code here: islands import this file.
import { z } from "zod";
import type { ClassResult, VersionInputs, VersionState } from "@/features/tapTables/tapTables";

export const signOffStates = ["pending", "approved", "rejected"] as const;
export type SignOffState = (typeof signOffStates)[number];

/** POST /api/v1/tap-tables/:id/versions/:v/sign-off. */
export const signOffRequest = z.object({
  reviewerId: z
    .string({ error: "Choose a reviewer (reviewerId)." })
    .trim()
    .min(1, "Choose a reviewer (reviewerId).")
    .max(36),
  message: z.string().trim().max(2000, "Keep the message under 2000 characters.").optional(),
});
export type SignOffRequest = z.infer<typeof signOffRequest>;

/** POST /api/v1/sign-offs/:id/decision. Sending back needs a reason. */
export const decisionRequest = z
  .object({
    decision: z.enum(["approve", "reject"], { error: 'decision must be "approve" or "reject".' }),
    comment: z.string().trim().max(4000, "Keep the comment under 4000 characters.").default(""),
  })
  .refine((d) => d.decision === "approve" || d.comment.length >= 5, {
    message: "Say what must change when sending a version back (a comment of at least a few words).",
    path: ["comment"],
  });
export type DecisionRequest = z.infer<typeof decisionRequest>;

/** POST /api/v1/sign-offs/:id/comments. */
export const commentRequest = z.object({
  body: z
    .string({ error: "Write the comment (body)." })
    .trim()
    .min(1, "Write the comment (body).")
    .max(8000, "Keep a comment under 8000 characters."),
  parentId: z.int().positive().optional(),
  channelName: z.string().trim().max(200).optional(),
});
export type CommentRequest = z.infer<typeof commentRequest>;

export const signOffParams = z.object({
  id: z.coerce.number({ error: "The sign-off id must be a number." }).int().positive(),
});
export const listQuery = z.object({
  state: z.enum(signOffStates).optional(),
  /** `me`: only the sign-offs the signed-in person reviews or requested. */
  mine: z.enum(["1", "0"]).optional(),
  limit: z.coerce.number().int().min(1).max(200).default(50),
  cursor: z.coerce.number().int().positive().optional(),
});

export const signOffStateLabels: Record<SignOffState, string> = {
  pending: "Awaiting decision",
  approved: "Approved",
  rejected: "Sent back",
};

export interface Person {
  id: string;
  name: string;
  email: string;
}

/** A sign-off in lists. */
export interface SignOffListItem {
  id: number;
  state: SignOffState;
  table: { id: number; name: string };
  version: number;
  versionState: VersionState;
  requestedBy: Person;
  reviewer: Person;
  createdAt: string | Date;
  decidedAt: string | Date | null;
}

export interface CommentView {
  id: number;
  parentId: number | null;
  author: Person;
  channelName: string | null;
  body: string;
  createdAt: string | Date;
}

/** GET /api/v1/sign-offs/:id: everything the reviewer needs on one page. */
export interface SignOffDetail extends SignOffListItem {
  message: string | null;
  decisionComment: string | null;
  budget: VersionInputs["budget"];
  architecture: VersionInputs["architecture"];
  study: VersionInputs["study"];
  registerMap: VersionInputs["registerMap"];
  requiredHeadroom_V: number;
  targetBer: number;
  classes: ClassResult[];
  comments: CommentView[];
}

export interface CommentNode extends CommentView {
  replies: CommentNode[];
}

/** Comments as a tree of threads, oldest first at every level; orphans become roots. */
export function commentTree(comments: readonly CommentView[]): CommentNode[] {
  const nodes = new Map<number, CommentNode>(comments.map((c) => [c.id, { ...c, replies: [] }]));
  const roots: CommentNode[] = [];
  const byTime = [...nodes.values()].sort(
    (a, b) => new Date(a.createdAt).getTime() - new Date(b.createdAt).getTime() || a.id - b.id,
  );
  for (const n of byTime) {
    const parent = n.parentId === null ? undefined : nodes.get(n.parentId);
    (parent ? parent.replies : roots).push(n);
  }
  return roots;
}
