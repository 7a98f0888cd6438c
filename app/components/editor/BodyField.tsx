// The Markdown body of a node (or the tree's introduction): write it, see it as the technician
// will, and add images (wiring diagrams, photos of the part) uploaded to the shop's storage.
import { useId, useRef, useState } from "react";
import { Markdown } from "~/components/Markdown";
import { TextField } from "./fields";

export type UploadImage = (file: File) => Promise<{ url: string; filename: string }>;

type Props = {
  label: string;
  initial: string;
  hint?: string;
  /** Tries the text; returns an error message or null. */
  onText: (raw: string) => string | null;
  upload?: UploadImage;
};

export function BodyField({ label, initial, hint, onText, upload }: Props) {
  const [raw, setRaw] = useState(initial);
  const [tab, setTab] = useState<"write" | "preview">("write");
  const [uploadState, setUploadState] = useState<{ busy: boolean; message?: string; error?: boolean }>({ busy: false });
  const writeArea = useRef<HTMLDivElement>(null);
  const fileId = useId();
  const previewId = useId();

  async function addImage(file: File) {
    if (!upload) return;
    setUploadState({ busy: true, message: `Uploading ${file.name}…` });
    try {
      const { url, filename } = await upload(file);
      const alt = filename.replace(/\.[^.]+$/, "").replace(/[[\]]/g, "");
      const el = writeArea.current?.querySelector("textarea");
      const at = el?.selectionEnd ?? raw.length;
      const before = raw.slice(0, at);
      const insert = `${before && !before.endsWith("\n\n") ? (before.endsWith("\n") ? "\n" : "\n\n") : ""}![${alt}](${url})\n`;
      const next = before + insert + raw.slice(at);
      setRaw(next);
      onText(next);
      setUploadState({ busy: false, message: `Added ${filename}. Edit the text in [ ] to describe the image.` });
    } catch (e) {
      setUploadState({ busy: false, error: true, message: e instanceof Error ? e.message : "The image could not be uploaded." });
    }
  }

  return (
    <div className="space-y-2">
      <div className="flex flex-wrap items-center gap-2" role="group" aria-label={`${label}: write or preview`}>
        <button type="button" className="btn-quiet min-h-11 px-3 text-base" aria-pressed={tab === "write"} onClick={() => setTab("write")}>
          Write
        </button>
        <button
          type="button"
          className="btn-quiet min-h-11 px-3 text-base"
          aria-pressed={tab === "preview"}
          aria-controls={tab === "preview" ? previewId : undefined}
          onClick={() => setTab("preview")}
        >
          Preview
        </button>
        {upload && (
          <>
            <label htmlFor={fileId} className="btn-quiet min-h-11 cursor-pointer px-3 text-base">
              Add an image
            </label>
            <input
              id={fileId}
              type="file"
              accept="image/jpeg,image/png,image/webp,image/gif"
              className="sr-only"
              disabled={uploadState.busy}
              onChange={(e) => {
                const f = e.target.files?.[0];
                e.target.value = "";
                if (f) void addImage(f);
              }}
            />
          </>
        )}
      </div>
      {uploadState.message && (
        <p role="status" className={uploadState.error ? "field-error" : "text-sm text-ink-soft"}>
          {uploadState.message}
        </p>
      )}
      <div ref={writeArea} className={tab === "write" ? "" : "hidden"}>
        <TextField
          label={label}
          hint={hint ?? "Markdown: **bold**, lists with -, images with ![what it shows](address)."}
          initial={initial}
          value={raw}
          onRaw={setRaw}
          multiline
          rows={6}
          onText={onText}
        />
      </div>
      {tab === "preview" && (
        <section id={previewId} aria-label={`${label} as the technician sees it`} className="rounded-lg border border-rule bg-paper p-3">
          {raw.trim() ? <Markdown>{raw}</Markdown> : <p className="text-ink-soft">Nothing written yet.</p>}
        </section>
      )}
    </div>
  );
}
