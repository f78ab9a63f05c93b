// How islands send a form or press an action button: busy while the request is out, and the API's
// message beside the form when it is refused. On success the action usually navigates or reloads,
// so the form stays busy until the page goes.
import { useState } from "react";

export function useSubmit() {
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);

  /** Runs `action`; a thrown error's message becomes `error` and the form is free again. */
  async function submit(action: () => Promise<void>): Promise<void> {
    setBusy(true);
    setError(null);
    try {
      await action();
    } catch (e) {
      setError((e as Error).message);
      setBusy(false);
    }
  }

  return { busy, error, setError, submit };
}
