import { useEffect, useId, useRef, useState } from 'react';
import { MAX_ATTACHMENT_BYTES, PHOTO_CONTENT_TYPES, PHOTO_SUBJECTS } from '@shared/schemas/visits';
import { newId } from '@/lib/ids';
import type { PhotoSubject } from '../api/upload-attachment';

export interface PickedPhoto {
  id: string;
  file: File;
  subject: PhotoSubject;
  previewUrl: string;
}

export const SUBJECT_LABELS: Record<PhotoSubject, string> = {
  manometer: 'Manometer',
  fan: 'Fan',
  suction_point: 'Suction point',
  other: 'Other',
};

const MIB = 1024 * 1024;

/** Why a file cannot be sent, checked on the device so nothing waits in the queue only to be refused. */
export function photoProblem(file: File): string | null {
  if (file.size > MAX_ATTACHMENT_BYTES) {
    return `${file.name} is ${(file.size / MIB).toFixed(1)} MB; a photo can be at most ${MAX_ATTACHMENT_BYTES / MIB} MB. Take it again at a lower resolution.`;
  }
  if (!(PHOTO_CONTENT_TYPES as readonly string[]).includes(file.type)) {
    return `${file.name} is not a JPEG, PNG or WebP photo. Set the camera to save JPEG ("most compatible") and take it again.`;
  }
  return null;
}

/** Photos for the visit: camera first, one subject each, a preview before saving. */
export function PhotoPicker({ photos, onChange }: { photos: PickedPhoto[]; onChange(photos: PickedPhoto[]): void }) {
  const inputId = useId();
  const [subject, setSubject] = useState<PhotoSubject>('manometer');
  const [problem, setProblem] = useState<string | null>(null);
  const inputRef = useRef<HTMLInputElement>(null);

  // Previews are object URLs: release them when the form goes away.
  const latest = useRef(photos);
  latest.current = photos;
  useEffect(() => () => latest.current.forEach((p) => URL.revokeObjectURL(p.previewUrl)), []);

  function add(files: FileList | null) {
    const list = Array.from(files ?? []);
    const problems: string[] = [];
    const added: PickedPhoto[] = [];
    for (const file of list) {
      const why = photoProblem(file);
      if (why) problems.push(why);
      else added.push({ id: newId(), file, subject, previewUrl: URL.createObjectURL(file) });
    }
    setProblem(problems.length ? problems.join(' ') : null);
    if (added.length) {
      onChange([...photos, ...added]);
      // Next photo is usually of the next thing on the checklist.
      const next = PHOTO_SUBJECTS[PHOTO_SUBJECTS.indexOf(subject) + 1];
      if (next && next !== 'other') setSubject(next);
    }
    if (inputRef.current) inputRef.current.value = '';
  }

  function remove(id: string) {
    const photo = photos.find((p) => p.id === id);
    if (photo) URL.revokeObjectURL(photo.previewUrl);
    onChange(photos.filter((p) => p.id !== id));
  }

  return (
    <div className="flex flex-col gap-3">
      <div className="grid grid-cols-1 gap-3 sm:grid-cols-2">
        <label className="flex flex-col gap-1 text-sm">
          <span className="font-medium">Photo of</span>
          <select className="min-h-11 rounded-md border border-rule bg-panel px-3" value={subject} onChange={(e) => setSubject(e.target.value as PhotoSubject)}>
            {PHOTO_SUBJECTS.map((s) => (
              <option key={s} value={s}>{SUBJECT_LABELS[s]}</option>
            ))}
          </select>
        </label>
        <div className="flex flex-col justify-end">
          <label
            htmlFor={inputId}
            className="flex min-h-11 cursor-pointer items-center justify-center rounded-md border border-accent bg-panel px-4 font-medium text-accent has-[:focus-visible]:outline-2 has-[:focus-visible]:outline-accent"
          >
            Take or choose a photo
          </label>
          <input
            ref={inputRef}
            id={inputId}
            type="file"
            accept="image/*"
            capture="environment"
            className="sr-only"
            onChange={(e) => add(e.target.files)}
          />
        </div>
      </div>
      {problem && (
        <p role="alert" className="rounded-md border border-state-bad/40 bg-state-bad/5 p-3 text-sm">
          {problem}
        </p>
      )}
      {photos.length > 0 && (
        <ul className="flex flex-col gap-2" aria-label="Photos to save">
          {photos.map((p) => (
            <li key={p.id} className="flex items-center gap-3 rounded-md border border-rule bg-panel p-2">
              <img src={p.previewUrl} alt={p.subject === 'other' ? 'Other photo' : `Photo of the ${SUBJECT_LABELS[p.subject].toLowerCase()}`} className="h-16 w-16 flex-none rounded object-cover" />
              <div className="flex min-w-0 flex-1 flex-col gap-1 text-sm">
                <select
                  aria-label={`What ${p.file.name} shows`}
                  className="min-h-11 rounded-md border border-rule bg-panel px-2"
                  value={p.subject}
                  onChange={(e) => onChange(photos.map((x) => (x.id === p.id ? { ...x, subject: e.target.value as PhotoSubject } : x)))}
                >
                  {PHOTO_SUBJECTS.map((s) => (
                    <option key={s} value={s}>{SUBJECT_LABELS[s]}</option>
                  ))}
                </select>
                <span className="tabular truncate text-xs text-muted">{p.file.name} · {(p.file.size / MIB).toFixed(1)} MB</span>
              </div>
              <button type="button" onClick={() => remove(p.id)} className="min-h-11 min-w-11 rounded-md border border-rule px-2 text-sm" aria-label={`Remove ${p.file.name}`}>
                Remove
              </button>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
