// "Add a channel": upload a file, or synthesize a line from its loss at Nyquist.
import { useState } from "react";
import UploadForm from "./UploadForm";
import SyntheticForm from "./SyntheticForm";

export default function AddChannel() {
  const [tab, setTab] = useState<"upload" | "synthetic">("upload");
  const tabs = [
    { key: "upload", label: "Upload a file" },
    { key: "synthetic", label: "Synthetic line" },
  ] as const;
  return (
    <section className="card" aria-label="Add a channel">
      <div className="mb-4 flex items-center gap-4">
        <h2>Add a channel</h2>
        <div role="tablist" className="flex gap-1 text-sm">
          {tabs.map((t) => (
            <button
              key={t.key}
              role="tab"
              type="button"
              aria-selected={tab === t.key}
              className={`rounded-md px-2.5 py-1 font-medium ${tab === t.key ? "bg-accent-soft text-accent-strong" : "text-ink-soft hover:bg-paper"}`}
              onClick={() => setTab(t.key)}
            >
              {t.label}
            </button>
          ))}
        </div>
      </div>
      <div role="tabpanel">{tab === "upload" ? <UploadForm /> : <SyntheticForm />}</div>
    </section>
  );
}
