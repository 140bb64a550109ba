// Photos for a report. Without JavaScript the file input is sent with the form (multipart).
// With JavaScript each photo is uploaded at once to /api/v1/uploads with a progress bar; the
// form then carries only the upload ids, so a retry after an error never re-sends the files.
import { useEffect, useRef, useState } from "react";

export type UploadedPhoto = {
  id: string;
  name: string;
  thumbUrl: string;
  exif: { lat: number | null; lon: number | null; takenAt: string | null };
};

type Pending = { key: string; name: string; progress: number; error?: string };

export const MAX_PHOTOS = 6;

export function PhotoUploader(props: {
  initial: UploadedPhoto[];
  error?: string;
  onChange?: (photos: UploadedPhoto[]) => void;
  onUsePosition?: (p: UploadedPhoto) => void;
  onUseTime?: (p: UploadedPhoto) => void;
  formatPosition: (lat: number, lon: number) => string;
  formatTime: (iso: string) => string;
}) {
  const [enhanced, setEnhanced] = useState(false);
  const [photos, setPhotos] = useState<UploadedPhoto[]>(props.initial);
  const [pending, setPending] = useState<Pending[]>([]);
  const [message, setMessage] = useState<string | null>(null);
  const input = useRef<HTMLInputElement>(null);
  const onChange = useRef(props.onChange);
  onChange.current = props.onChange;

  useEffect(() => setEnhanced(true), []);
  useEffect(() => onChange.current?.(photos), [photos]);

  function upload(file: File, key: string): Promise<UploadedPhoto | null> {
    return new Promise((resolve) => {
      const xhr = new XMLHttpRequest();
      xhr.open("POST", "/api/v1/uploads");
      xhr.responseType = "json";
      xhr.upload.onprogress = (e) => {
        if (e.lengthComputable) setPending((p) => p.map((x) => (x.key === key ? { ...x, progress: e.loaded / e.total } : x)));
      };
      xhr.onload = () => {
        const body = xhr.response as { id?: string; thumbUrl?: string; exif?: UploadedPhoto["exif"]; error?: string } | null;
        if (xhr.status === 201 && body?.id) {
          setPending((p) => p.filter((x) => x.key !== key));
          resolve({ id: body.id, name: file.name, thumbUrl: body.thumbUrl!, exif: body.exif ?? { lat: null, lon: null, takenAt: null } });
        } else {
          const error = body?.error ?? `Upload failed (${xhr.status})`;
          setPending((p) => p.map((x) => (x.key === key ? { ...x, error } : x)));
          resolve(null);
        }
      };
      xhr.onerror = () => {
        setPending((p) => p.map((x) => (x.key === key ? { ...x, error: "The upload was interrupted: check your connection and add the photo again" } : x)));
        resolve(null);
      };
      const body = new FormData();
      body.append("photo", file, file.name);
      xhr.send(body);
    });
  }

  async function onFiles(list: FileList | null) {
    if (!list || !enhanced) return;
    const files = [...list];
    if (input.current) input.current.value = ""; // the ids travel with the form, not the files
    const room = MAX_PHOTOS - photos.length - pending.filter((p) => !p.error).length;
    setMessage(files.length > room ? `At most ${MAX_PHOTOS} photos per report: ${files.length - Math.max(room, 0)} not added.` : null);
    const chosen = files.slice(0, Math.max(room, 0));
    const keyed = chosen.map((f, i) => ({ f, key: `${Date.now()}-${i}-${f.name}` }));
    setPending((p) => [...p.filter((x) => !x.error), ...keyed.map(({ f, key }) => ({ key, name: f.name, progress: 0 }))]);
    for (const { f, key } of keyed) {
      const done = await upload(f, key);
      if (done) setPhotos((p) => [...p, done]);
    }
  }

  return (
    <div>
      <label htmlFor="photos" className="field-label">
        Photos (optional, up to {MAX_PHOTOS}, JPEG, PNG or WebP, at most 20 MB each)
      </label>
      <input
        ref={input}
        id="photos"
        name="photos"
        type="file"
        multiple
        accept="image/jpeg,image/png,image/webp"
        className="field-input"
        aria-invalid={props.error ? true : undefined}
        aria-describedby="photos-hint"
        onChange={(e) => void onFiles(e.currentTarget.files)}
      />
      <p id="photos-hint" className="field-hint">
        Published copies are resized and carry no location or camera data. A photo's own GPS position and time can fill in the form.
      </p>
      {props.error ? (
        <p className="field-error" role="alert">
          {props.error}
        </p>
      ) : null}
      {message ? <p className="field-error">{message}</p> : null}
      <ul className="mt-3 grid gap-3 sm:grid-cols-2" aria-live="polite">
        {pending.map((p) => (
          <li key={p.key} className="card text-sm">
            <div className="font-semibold">{p.name}</div>
            {p.error ? (
              <p className="field-error" role="alert">
                {p.error}
              </p>
            ) : (
              <>
                <progress className="mt-2 w-full" max={1} value={p.progress} aria-label={`Uploading ${p.name}`} />
                <span className="text-xs text-slate">{Math.round(p.progress * 100)}%</span>
              </>
            )}
          </li>
        ))}
        {photos.map((p, i) => (
          <li key={p.id} className="card flex gap-3 text-sm" data-testid="uploaded-photo">
            <input type="hidden" name="uploadId" value={p.id} />
            <img src={p.thumbUrl} alt={`Photo ${i + 1}: ${p.name}`} className="h-20 w-20 rounded object-cover" />
            <div className="min-w-0 flex-1">
              <div className="truncate font-semibold">
                Photo {i + 1}: {p.name}
              </div>
              {p.exif.lat !== null && p.exif.lon !== null ? (
                <div className="mt-1">
                  GPS tag: <span className="position">{props.formatPosition(p.exif.lat, p.exif.lon)}</span>{" "}
                  {props.onUsePosition ? (
                    <button type="button" className="underline" onClick={() => props.onUsePosition!(p)}>
                      use as own position
                    </button>
                  ) : null}
                </div>
              ) : null}
              {p.exif.takenAt ? (
                <div className="mt-1">
                  Taken {props.formatTime(p.exif.takenAt)}{" "}
                  {props.onUseTime ? (
                    <button type="button" className="underline" onClick={() => props.onUseTime!(p)}>
                      use as observation time
                    </button>
                  ) : null}
                </div>
              ) : null}
              <button type="button" className="mt-1 text-danger underline" onClick={() => setPhotos((all) => all.filter((x) => x.id !== p.id))}>
                Remove
              </button>
            </div>
          </li>
        ))}
      </ul>
    </div>
  );
}
