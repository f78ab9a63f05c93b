// The threaded comments of a sign-off: every role may comment, reply, and tie a comment to a channel.
import { useState } from "react";
import { useStore } from "zustand";
import { formatWhen } from "@/components/format";
import { commentTree, type CommentNode, type CommentView } from "./signoff";
import { createThreadStore, type ThreadState } from "./threadStore";

interface Props {
  signOffId: number;
  comments: CommentView[];
  channelNames: string[];
}

function Composer(props: { state: ThreadState; parentId: number | null; channelNames: string[]; onDone?: () => void }) {
  const [body, setBody] = useState("");
  const [channel, setChannel] = useState("");
  const label = props.parentId ? "Reply" : "Comment";
  return (
    <form
      className="flex flex-col gap-2"
      aria-label={label}
      onSubmit={async (e) => {
        e.preventDefault();
        if (await props.state.post(body, props.parentId, channel || null)) {
          setBody("");
          setChannel("");
          props.onDone?.();
        }
      }}
    >
      <textarea
        className="input min-h-16"
        aria-label={`${label} text`}
        value={body}
        onChange={(e) => setBody(e.target.value)}
        maxLength={8000}
        required
        placeholder={props.parentId ? "Your reply…" : "A question or remark for the thread…"}
      />
      <div className="flex flex-wrap items-center gap-2">
        {!props.parentId && (
          <label className="flex items-center gap-2 text-xs text-ink-soft">
            About channel
            <select className="input py-0.5 text-xs" value={channel} onChange={(e) => setChannel(e.target.value)}>
              <option value="">— the whole version —</option>
              {props.channelNames.map((n) => (
                <option key={n} value={n}>
                  {n}
                </option>
              ))}
            </select>
          </label>
        )}
        <button className="btn btn-primary" type="submit" disabled={props.state.busy || !body.trim()}>
          {props.state.busy ? "Sending…" : label}
        </button>
        {props.onDone && (
          <button className="btn" type="button" onClick={props.onDone}>
            Cancel
          </button>
        )}
      </div>
    </form>
  );
}

function Comment(props: { node: CommentNode; state: ThreadState; channelNames: string[]; depth: number }) {
  const { node, state } = props;
  return (
    <li className={props.depth > 0 ? "mt-3 border-l-2 border-line pl-4" : "mt-4"} data-comment={node.id}>
      <div className="flex flex-wrap items-baseline gap-2 text-sm">
        <strong>{node.author.name}</strong>
        <span className="num text-xs text-muted">{formatWhen(node.createdAt)}</span>
        {node.channelName && <span className="badge bg-paper text-ink-soft">{node.channelName}</span>}
      </div>
      <p className="mt-1 whitespace-pre-wrap text-sm">{node.body}</p>
      {state.replyTo === node.id ? (
        <div className="mt-2">
          <Composer
            state={state}
            parentId={node.id}
            channelNames={props.channelNames}
            onDone={() => state.setReplyTo(null)}
          />
        </div>
      ) : (
        <button
          className="mt-1 text-xs text-accent-strong hover:underline"
          type="button"
          onClick={() => state.setReplyTo(node.id)}
        >
          Reply
        </button>
      )}
      {node.replies.length > 0 && (
        <ul>
          {node.replies.map((r) => (
            <Comment key={r.id} node={r} state={state} channelNames={props.channelNames} depth={props.depth + 1} />
          ))}
        </ul>
      )}
    </li>
  );
}

export default function CommentThread(props: Props) {
  const [store] = useState(() => createThreadStore(props.signOffId, props.comments));
  const state = useStore(store);
  const tree = commentTree(state.comments);
  return (
    <div>
      {tree.length === 0 ? (
        <p className="text-sm text-muted">No comments yet.</p>
      ) : (
        <ul aria-label="Comments">
          {tree.map((n) => (
            <Comment key={n.id} node={n} state={state} channelNames={props.channelNames} depth={0} />
          ))}
        </ul>
      )}
      {state.error && (
        <p className="notice notice-bad mt-3" role="alert">
          {state.error}
        </p>
      )}
      <div className="mt-5">
        <Composer state={state} parentId={null} channelNames={props.channelNames} />
      </div>
    </div>
  );
}
