// State of a sign-off's comment thread: the comments, which one is being answered, sending.
import { createStore } from "zustand/vanilla";
import { api } from "@/components/api";
import type { CommentView } from "./signoff";

export interface ThreadState {
  comments: CommentView[];
  replyTo: number | null;
  busy: boolean;
  error: string | null;
  setReplyTo(id: number | null): void;
  /** Posts a comment (a reply when `parentId` is given); resolves true when it was saved. */
  post(body: string, parentId: number | null, channelName: string | null): Promise<boolean>;
}

export function createThreadStore(signOffId: number, comments: CommentView[]) {
  return createStore<ThreadState>()((set, get) => ({
    comments,
    replyTo: null,
    busy: false,
    error: null,
    setReplyTo: (replyTo) => set({ replyTo, error: null }),
    async post(body, parentId, channelName) {
      set({ busy: true, error: null });
      try {
        const c = await api<CommentView>(`/api/v1/sign-offs/${signOffId}/comments`, {
          method: "POST",
          json: { body, ...(parentId ? { parentId } : {}), ...(channelName ? { channelName } : {}) },
        });
        set({ comments: [...get().comments, c], busy: false, replyTo: null });
        return true;
      } catch (e) {
        set({ busy: false, error: (e as Error).message });
        return false;
      }
    },
  }));
}
