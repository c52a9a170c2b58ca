import { useEffect, useState } from 'react';
import { useMutation } from '@tanstack/react-query';
import { uploadFile, Progress } from './xhr';
import { Thumb } from './Thumb';

export interface Uploaded { id: string; url: string; fileName: string }

/** Photos taken without a network: kept as files on the phone until the entry is sent. */
interface KeptPhotos { files: File[]; onChange: (files: File[]) => void }

function KeptThumb({ file, onLeaveOut }: { file: File; onLeaveOut: () => void }) {
  const [url, setUrl] = useState<string | null>(null);
  useEffect(() => {
    const u = URL.createObjectURL(file);
    setUrl(u);
    return () => URL.revokeObjectURL(u);
  }, [file]);
  return (
    <div className="grid gap-1 justify-items-center">
      {url && <img src={url} alt={file.name} width={72} height={72} className="size-18 object-cover rounded border border-line" />}
      <button type="button" className="btn btn-quiet btn-sm" onClick={onLeaveOut}>Leave out</button>
    </div>
  );
}

/**
 * Takes or picks photos and uploads each at once (with progress) to the device, for the entry to claim. Without a
 * network (when `kept` is given) the photos stay on the phone and go with the entry when it is sent.
 */
export function PhotoPicker({ deviceId, photos, onChange, kept }: { deviceId: string; photos: Uploaded[]; onChange: (p: Uploaded[]) => void; kept?: KeptPhotos }) {
  const [progress, setProgress] = useState<number | null>(null);
  const [error, setError] = useState<string | null>(null);
  const upload = useMutation({
    mutationFn: (file: File) => uploadFile<Uploaded>({ ownerType: 'device', ownerId: deviceId, kind: 'photo' }, file, setProgress),
  });
  async function pick(files: FileList | null) {
    if (!files?.length) return;
    setError(null);
    if (kept && !navigator.onLine) {
      kept.onChange([...kept.files, ...Array.from(files)]);
      return;
    }
    const added: Uploaded[] = [];
    for (const file of Array.from(files)) {
      try {
        setProgress(0);
        added.push(await upload.mutateAsync(file));
      } catch (err) {
        setError(`${file.name}: ${(err as Error).message}`);
      }
    }
    setProgress(null);
    onChange([...photos, ...added]);
  }
  return (
    <div className="grid gap-2">
      <label className="btn btn-quiet justify-center min-h-12 text-base cursor-pointer">
        Add photos
        <input type="file" accept="image/jpeg,image/png,image/webp" capture="environment" multiple className="sr-only" data-testid="log-photo-input"
          onChange={(e) => { pick(e.target.files); e.target.value = ''; }} />
      </label>
      {progress !== null && <Progress value={progress} label="Uploading photo" />}
      {error && <p className="field-error" role="alert">{error}</p>}
      {kept && kept.files.length > 0 && (
        <div className="flex flex-wrap gap-2 items-start" aria-label="Photos kept on this phone for this entry">
          {kept.files.map((f, i) => <KeptThumb key={`${f.name}-${i}`} file={f} onLeaveOut={() => kept.onChange(kept.files.filter((x) => x !== f))} />)}
        </div>
      )}
      {photos.length > 0 && (
        <div className="flex flex-wrap gap-2 items-start" aria-label="Photos for this entry">
          {photos.map((p) => (
            <div key={p.id} className="grid gap-1 justify-items-center">
              <Thumb url={p.url} name={p.fileName} size={72} />
              <button type="button" className="btn btn-quiet btn-sm" onClick={() => onChange(photos.filter((x) => x.id !== p.id))}>Leave out</button>
            </div>
          ))}
        </div>
      )}
    </div>
  );
}
