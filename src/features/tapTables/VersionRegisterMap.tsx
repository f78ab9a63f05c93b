// A version's register map: read-only when frozen or in review; otherwise editable, and saving a
// changed map recomputes the version's codes.
import { useState } from "react";
import { api } from "@/components/api";
import RegisterMapEditor from "./RegisterMapEditor";
import type { RegisterField } from "./registerMap";

interface Props {
  tableId: number;
  version: number;
  fields: RegisterField[];
  editable: boolean;
}

export default function VersionRegisterMap(props: Props) {
  const [editing, setEditing] = useState(false);
  const [fields, setFields] = useState(props.fields);
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);

  async function save() {
    setBusy(true);
    setError(null);
    try {
      await api(`/api/v1/tap-tables/${props.tableId}/versions/${props.version}`, {
        method: "PUT",
        json: { registerMap: fields },
      });
      location.reload();
    } catch (e) {
      setError((e as Error).message);
      setBusy(false);
    }
  }

  return (
    <div>
      <RegisterMapEditor fields={editing ? fields : props.fields} onChange={editing ? setFields : undefined} />
      {error && (
        <p className="notice notice-bad mt-2" role="alert">
          {error}
        </p>
      )}
      {props.editable && (
        <div className="mt-3 flex gap-2">
          {editing ? (
            <>
              <button className="btn btn-primary" type="button" onClick={save} disabled={busy}>
                {busy ? "Saving…" : "Save and recompute"}
              </button>
              <button
                className="btn"
                type="button"
                onClick={() => {
                  setEditing(false);
                  setFields(props.fields);
                  setError(null);
                }}
              >
                Cancel
              </button>
            </>
          ) : (
            <button className="btn" type="button" onClick={() => setEditing(true)}>
              Edit the register map
            </button>
          )}
        </div>
      )}
    </div>
  );
}
