import { useState } from 'react';
import { useMutation } from '@tanstack/react-query';
import { uploadFile, Progress } from './xhr';
import { Thumb } from './Thumb';

export interface Uploaded { id: string; url: string; fileName: string }

/** Takes or picks photos and uploads each at once (with progress) to the device, for the entry to claim. */
export function PhotoPicker({ deviceId, photos, onChange }: { deviceId: string; photos: Uploaded[]; onChange: (p: Uploaded[]) => void }) {
  const [progress, setProgress] = useState<number | null>(null);
  const [error, setError] = useState<string | null>(null);
  const upload = useMutation({
    mutationFn: (file: File) => uploadFile<Uploaded>({ ownerType: 'device', ownerId: deviceId, kind: 'photo' }, file, setProgress),
  });
  async function pick(files: FileList | null) {
    if (!files?.length) return;
    setError(null);
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
