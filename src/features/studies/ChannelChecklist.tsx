// The channel checklist of the study and sweep forms: every channel that runs at the budget's bit
// rate, with its loss at Nyquist, "All" and "None", and the count chosen.
import type { StudyChannelChoice } from "./newStudyStore";

interface Props {
  channels: StudyChannelChoice[];
  chosenIds: number[];
  setChannels: (ids: number[]) => void;
  toggleChannel: (id: number) => void;
  /** Tailwind class bounding the list's height. */
  listHeightClass: string;
}

export default function ChannelChecklist({ channels, chosenIds, setChannels, toggleChannel, listHeightClass }: Props) {
  return (
    <fieldset className="rounded-md border border-line p-3">
      <legend className="px-1 text-sm font-medium text-ink-soft">
        Channels ({chosenIds.length} of {channels.length})
      </legend>
      <div className="mb-2 flex gap-2 text-xs">
        <button type="button" className="btn py-0.5 text-xs" onClick={() => setChannels(channels.map((c) => c.id))}>
          All
        </button>
        <button type="button" className="btn py-0.5 text-xs" onClick={() => setChannels([])}>
          None
        </button>
      </div>
      <ul className={`${listHeightClass} overflow-auto text-sm`}>
        {channels.map((c) => (
          <li key={c.id}>
            <label className="flex items-center gap-2 py-0.5">
              <input type="checkbox" checked={chosenIds.includes(c.id)} onChange={() => toggleChannel(c.id)} />
              <span className="grow">{c.name}</span>
              <span className="num text-xs text-muted">
                {c.lossAtNyquist_dB !== null ? `${c.lossAtNyquist_dB.toFixed(1)} dB` : "—"}
              </span>
            </label>
          </li>
        ))}
        {channels.length === 0 && <li className="text-muted">No channel runs at this budget's bit rate.</li>}
      </ul>
    </fieldset>
  );
}
